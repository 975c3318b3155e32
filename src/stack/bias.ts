import type { LengthSlice } from '../device/types.js';
import type { Topology } from '../spec/types.js';
import type { Role } from '../solve/types.js';
import { rolesOf } from './topology.js';
import { vgsForCurrent } from './invert.js';
import { covers, rangeError } from './range.js';
import { StackwrightError } from '../errors.js';

/** A diode-connected bias device in stack coordinates. */
export interface BiasDevice {
  drives: Role;
  w: number;
  l: number;
  current: number;
  /** Gate voltage it produces, stack coordinates. */
  gate: number;
  vgs: number;
  vsb: number;
  /** Index of the bias device it sits on (cascode-stacked), else undefined. */
  stackedOn?: number;
}

/**
 * Diodes (gate = drain) that reproduce each gate voltage at current `ib`, one
 * per output device with the same L. Low-voltage biasing: every diode on the
 * rail (VSB = 0, VDS = VGS = gate). Stacked cascode: the top diode sits on the
 * bottom one (VSB = g1, VGS = g2 − g1). W = ib / jd(VGS, VGS, VSB).
 * Throws kind 'range' when a diode bias is outside the table.
 */
export function biasDevices(topology: Topology, slices: readonly LengthSlice[], gates: readonly number[], ib: number): BiasDevice[] {
  const roles = rolesOf(topology);
  return roles.map((drives, k) => {
    const stacked = topology === 'cascode-stacked' && k === 1;
    const vsb = stacked ? gates[0] : 0;
    const vgs = gates[k] - vsb;
    const slice = slices[k];
    if (!covers(slice, vgs, vgs, vsb)) throw rangeError(slice, vgs, vgs, vsb, `bias diode for the ${drives} gate`);
    const jd = slice.jd(vgs, vgs, vsb);
    if (!(jd > 0)) throw new StackwrightError(`bias diode for the ${drives} gate carries no current at VGS = ${vgs.toFixed(3)} V`, { kind: 'range' });
    const out: BiasDevice = { drives, w: ib / jd, l: slice.l, current: ib, gate: gates[k], vgs, vsb };
    if (stacked) out.stackedOn = 0;
    return out;
  });
}

/**
 * Gate voltages (stack coordinates) the given bias diodes produce on another
 * corner or kit: each diode's VGS where w·jd(VGS, VGS, VSB) = its current,
 * stacked diodes on top of the one below. Throws kind 'range' when the table
 * cannot reach a diode's current.
 */
export function biasGates(bias: readonly Pick<BiasDevice, 'w' | 'current' | 'stackedOn' | 'drives'>[], slices: readonly LengthSlice[]): number[] {
  const gates: number[] = [];
  bias.forEach((b, k) => {
    const vsb = b.stackedOn === undefined ? 0 : gates[b.stackedOn];
    const vgs = vgsForCurrent(slices[k], b.w, b.current, 'diode', vsb);
    if (vgs === null) {
      throw new StackwrightError(`bias diode for the ${b.drives} gate cannot carry ${b.current.toExponential(3)} A within the table (VSB = ${vsb.toFixed(3)} V)`, { kind: 'range' });
    }
    gates.push(vsb + vgs);
  });
  return gates;
}
