import type { DeviceBias, StackDevice } from './types.js';
import { covers } from './range.js';
import { illinois, vgsWindow } from './invert.js';
import { emptyBias, evalDevice } from './evaluate-device.js';
import { routOf } from './rout.js';

/** The input side of a stage carrying a given current: its input gate (stack coordinates), nodes and devices. */
export interface InputOp {
  /** Gate of the input (bottom) device that lets the side carry the current, stack coordinates, V. */
  gate: number;
  /** Node voltages x_0..x_N, stack coordinates. */
  nodes: number[];
  devices: DeviceBias[];
  /** Small-signal resistance looking into the side, input gate at AC ground, Ω. */
  rout: number;
}

/**
 * Solve the input side (one device, or input device plus a cascode with a
 * fixed gate `cascodeGate`) at stack voltage `v` carrying current `i`.
 * Cascode: the cascode's current falls monotonically as its source node x1
 * rises (VGS and VDS fall, VSB rises), so x1 is found by bisection; then the
 * input gate follows from the input device's current at VDS = x1. Null when the
 * side cannot carry `i` at `v` within the table (no input voltage would do).
 */
export function inputAtCurrent(devices: readonly StackDevice[], cascodeGate: number | undefined, v: number, i: number): InputOp | null {
  if (!(v > 0) || !(i > 0)) return null;
  const d0 = devices[0];
  let x1 = v;
  if (devices.length > 1) {
    const d1 = devices[1];
    const g = cascodeGate as number;
    const r = d1.slice.range;
    const top = (x: number): number => (covers(d1.slice, g - x, v - x, x) ? d1.w * d1.slice.jd(g - x, v - x, x) : NaN);
    let lo = Math.max(0, r.vsb[0], g - r.vgs[1], v - r.vds[1]);
    let hi = Math.min(v - r.vds[0], r.vsb[1], g - r.vgs[0]);
    if (!(hi > lo)) return null;
    // The cascode must be able to pass i at the lowest x1 the table allows; at the highest it passes less.
    const flo = top(lo);
    if (!(flo >= i)) return null;
    const fhi = top(hi);
    if (fhi >= i) return null;
    x1 = illinois((x) => top(x) - i, lo, hi, 1e-10);
  }
  const g0 = gateForCurrent(d0, i, x1);
  if (g0 === null) return null;
  const b0 = emptyBias();
  if (!evalDevice(d0, g0, x1, 0, b0)) return null;
  const out = [b0];
  const nodes = [0, x1];
  if (devices.length > 1) {
    const b1 = emptyBias();
    if (!evalDevice(devices[1], (cascodeGate as number) - x1, v - x1, x1, b1)) return null;
    out.push(b1);
    nodes.push(v);
  }
  return { gate: g0, nodes, devices: out, rout: routOf(out) };
}

/** VGS at which the device carries i at VDS = vds, VSB = 0 (current rises with VGS); null when the table does not reach it. */
function gateForCurrent(d: StackDevice, i: number, vds: number): number | null {
  const win = vgsWindow(d.slice, vds, 0);
  if (!win) return null;
  const f = (vgs: number) => i - d.w * d.slice.jd(vgs, vds, 0);
  if (f(win[0]) < 0 || f(win[1]) >= 0) return null;
  return illinois(f, win[0], win[1], 1e-10);
}
