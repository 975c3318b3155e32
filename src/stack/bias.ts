import type { LengthSlice } from '../device/types.js';
import type { Role, StackShape } from './types.js';
import { vgsForCurrent } from './invert.js';
import { covers, outsideSlice } from './range.js';
import { StackwrightError } from '../errors.js';
import { formatEng } from '../units/index.js';

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

/** How to lengthen a bias diode that would come out narrower than the minimum width. */
export interface DiodeWidening {
  /** Narrowest drawable width, m. */
  wmin: number;
  /** Lengths a diode may take, ascending, m. */
  lengths: readonly number[];
  slice(l: number): LengthSlice;
}

// W of a diode at one length, or null when the table cannot hold its bias.
function diodeWidth(slice: LengthSlice, vgs: number, vsb: number, ib: number): number | null {
  if (!covers(slice, vgs, vgs, vsb)) return null;
  const jd = slice.jd(vgs, vgs, vsb);
  return jd > 0 ? ib / jd : null;
}

/**
 * Diodes (gate = drain) that reproduce each gate voltage at current `ib`, one
 * per output device with the same L. Low-voltage biasing: every diode on the
 * rail (VSB = 0, VDS = VGS = gate). Stacked biasing: diode k sits on diode k − 1
 * (VSB = g(k−1), VGS = g(k) − g(k−1)). W = ib / jd(VGS, VGS, VSB).
 * With `widen`, a diode narrower than wmin takes the next longer length until
 * W ≥ wmin (same VGS, so the same voltage); null when no length does.
 * Throws kind 'range' when a diode bias is outside the table.
 */
export function biasDevices(shape: StackShape, slices: readonly LengthSlice[], gates: readonly number[], ib: number): BiasDevice[];
export function biasDevices(shape: StackShape, slices: readonly LengthSlice[], gates: readonly number[], ib: number, widen: DiodeWidening): BiasDevice[] | null;
export function biasDevices(
  shape: StackShape,
  slices: readonly LengthSlice[],
  gates: readonly number[],
  ib: number,
  widen?: DiodeWidening,
): BiasDevice[] | null {
  const roles = shape.roles;
  const out: BiasDevice[] = [];
  for (let k = 0; k < roles.length; k++) {
    const drives = roles[k];
    const stacked = shape.stackedBias && k > 0;
    const vsb = stacked ? gates[k - 1] : 0;
    const vgs = gates[k] - vsb;
    const slice = slices[k];
    if (!covers(slice, vgs, vgs, vsb)) throw outsideSlice(slice, vgs, vgs, vsb, `bias diode for the ${drives} gate`);
    let w = diodeWidth(slice, vgs, vsb, ib);
    if (w === null) throw new StackwrightError(`bias diode for the ${drives} gate carries no current at VGS = ${formatEng(vgs, 'V', 4)}`, { kind: 'range' });
    let l = slice.l;
    if (widen && w < widen.wmin) {
      const next = widen.lengths.find((x) => x > l * (1 + 1e-9) && (diodeWidth(widen.slice(x), vgs, vsb, ib) ?? 0) >= widen.wmin);
      if (next === undefined) return null;
      w = diodeWidth(widen.slice(next), vgs, vsb, ib)!;
      l = next;
    }
    const b: BiasDevice = { drives, w, l, current: ib, gate: gates[k], vgs, vsb };
    if (stacked) b.stackedOn = k - 1;
    out.push(b);
  }
  return out;
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
      throw new StackwrightError(`bias diode for the ${b.drives} gate cannot carry ${formatEng(b.current, 'A', 4)} within the table (VSB = ${formatEng(vsb, 'V', 4)})`, { kind: 'range' });
    }
    gates.push(vsb + vgs);
  });
  return gates;
}
