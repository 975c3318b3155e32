import type { DeviceBias, StackDevice } from './types.js';
import { fallingRoot } from '../numeric/illinois.js';
import { fallingNewton, type FallingSloped } from '../numeric/safe-newton.js';
import { CurrentLine } from './current-line.js';
import { covers } from './range.js';
import { vgsWindow } from './invert.js';
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

/** Where a neighbouring solution put the cascode's source node and the input gate (stack coordinates), V. */
export interface InputGuess {
  x1: number;
  gate: number;
}

/** First half-width of the bracket tried around a guess, V; widened ×4 until it holds the root. */
const GUESS_SPAN = 4e-3;

// The cascode's current over the current asked for, as its source node x rises (VGS and VDS fall by x, VSB rises by
// x), and the current asked for over the input device's, as its VGS rises (VSB = 0); both as logs (see CurrentLine).
const cascodeExcess = new CurrentLine();
const inputShortfall = new CurrentLine();

/**
 * Root of f in [lo, hi] with f(lo) ≥ 0 > f(hi) (one sign change: f falls
 * monotonically) to `tol`, by Illinois. With a guess (a neighbouring
 * solution), the bracket is first narrowed around it, so a few samples do
 * instead of a search over the whole interval; the root is the same to `tol`.
 */
function rootNear(f: FallingSloped, sloped: boolean, lo: number, hi: number, tol: number, guess?: number): number {
  // With exact slopes, Newton from the guess: a handful of lookups where the bracketing below takes about ten.
  if (sloped) {
    const x = fallingNewton(f, lo, hi, tol, guess ?? NaN);
    if (!Number.isNaN(x)) return x;
  }
  if (guess === undefined || !(guess > lo && guess < hi)) return fallingRoot(f, lo, hi, tol);
  const fg = f.at(guess);
  if (!(fg >= 0) && !(fg < 0)) return fallingRoot(f, lo, hi, tol);
  // Grow the bracket away from the guess towards the root, keeping f(a) ≥ 0 > f(b).
  const up = fg >= 0;
  let a = up ? guess : lo;
  let b = up ? hi : guess;
  let fa = up ? fg : NaN;
  let fb = up ? NaN : fg;
  for (let d = GUESS_SPAN; up ? guess + d < hi : guess - d > lo; d *= 4) {
    const x = up ? guess + d : guess - d;
    const fx = f.at(x);
    if (!(fx >= 0) && !(fx < 0)) return fallingRoot(f, lo, hi, tol);
    if (fx >= 0) {
      a = x;
      fa = fx;
    } else {
      b = x;
      fb = fx;
    }
    if (up ? fx < 0 : fx >= 0) break;
  }
  // The samples already taken at the bracket ends are not taken again.
  return fallingRoot(f, a, b, tol, fa, fb);
}

/**
 * The root from a neighbouring solution by Newton steps alone (slices with exact slopes), before the ends of the
 * bracket are checked: reaching a root proves one exists in [lo, hi] (f falls), so the two end samples are needed
 * only when this fails (NaN), as they are near a rail or a table edge. To 1e-10 V, as rootNear.
 */
function quickRoot(f: FallingSloped, sloped: boolean, lo: number, hi: number, guess: number | undefined): number {
  return sloped && guess !== undefined ? fallingNewton(f, lo, hi, 1e-10, guess, true) : NaN;
}

/**
 * Solve the input side (one device, or input device plus a cascode with a
 * fixed gate `cascodeGate`) at stack voltage `v` carrying current `i`.
 * Cascode: the cascode's current falls monotonically as its source node x1
 * rises (VGS and VDS fall, VSB rises), so x1 is found by bisection; then the
 * input gate follows from the input device's current at VDS = x1. Null when the
 * side cannot carry `i` at `v` within the table (no input voltage would do).
 * `guess`, a solution at a nearby voltage or current, only speeds up the root searches.
 */
export function inputAtCurrent(devices: readonly StackDevice[], cascodeGate: number | undefined, v: number, i: number, guess?: InputGuess): InputOp | null {
  return solveInput(devices, cascodeGate, v, i, guess?.x1, guess?.gate) ? solvedOp(devices.length, v) : null;
}

/** The last solveInput's answer as an InputOp (`n` devices at stack voltage `v`), copied out of `solved`. */
export function solvedOp(n: number, v: number): InputOp {
  const out = [{ ...solved.devices[0] }];
  const nodes = [0, solved.x1];
  if (n > 1) {
    out.push({ ...solved.devices[1] });
    nodes.push(v);
  }
  return { gate: solved.gate, nodes, devices: out, rout: solved.rout };
}

/** The last solveInput's answer, overwritten by the next (the gain-only callers allocate nothing). */
export const solved = { gate: 0, x1: 0, rout: 0, devices: [emptyBias(), emptyBias()] as DeviceBias[] };
// routOf over the devices solved: the input device alone, or with its cascode.
const solvedOne: DeviceBias[] = [solved.devices[0]];

/**
 * inputAtCurrent into `solved`: false where it gives null. The guess comes as two numbers, so that every caller's
 * guess object (InputGuess, StageSample) is read at its own site and this hot function stays monomorphic.
 */
export function solveInput(devices: readonly StackDevice[], cascodeGate: number | undefined, v: number, i: number, x1Guess?: number, gateGuess?: number): boolean {
  if (!(v > 0) || !(i > 0)) return false;
  const d0 = devices[0];
  let x1 = v;
  if (devices.length > 1) {
    const d1 = devices[1];
    const g = cascodeGate as number;
    const r = d1.slice.range;
    const lo = Math.max(0, r.vsb[0], g - r.vgs[1], v - r.vds[1]);
    const hi = Math.min(v - r.vds[0], r.vsb[1], g - r.vgs[0]);
    if (!(hi > lo)) return false;
    const top = cascodeExcess.of(d1.slice, d1.w, i, true, true).along(g, v, 0, -1, -1, 1);
    const sloped = d1.slice.jdSlopes !== undefined;
    x1 = quickRoot(top, sloped, lo, hi, x1Guess);
    if (Number.isNaN(x1)) {
      // The cascode must be able to pass i at the lowest x1 the table allows; at the highest it passes less.
      if (!(top.at(lo) >= 0)) return false;
      if (top.at(hi) >= 0) return false;
      x1 = rootNear(top, sloped, lo, hi, 1e-10, x1Guess);
    }
  }
  const g0 = gateForCurrent(d0, i, x1, gateGuess);
  if (g0 === null) return false;
  const b = solved.devices;
  if (!evalDevice(d0, g0, x1, 0, b[0])) return false;
  if (devices.length > 1 && !evalDevice(devices[1], (cascodeGate as number) - x1, v - x1, x1, b[1])) return false;
  solved.gate = g0;
  solved.x1 = x1;
  solved.rout = routOf(devices.length > 1 ? b : solvedOne);
  return true;
}

/** VGS at which the device carries i at VDS = vds, VSB = 0 (current rises with VGS); null when the table does not reach it. */
function gateForCurrent(d: StackDevice, i: number, vds: number, guess?: number): number | null {
  const win = vgsWindow(d.slice, vds, 0);
  if (!win) return null;
  const f = inputShortfall.of(d.slice, d.w, i, false, true).along(0, vds, 0, 1, 0, 0);
  const sloped = d.slice.jdSlopes !== undefined;
  const quick = quickRoot(f, sloped, win[0], win[1], guess);
  if (!Number.isNaN(quick)) return quick;
  if (f.at(win[0]) < 0 || f.at(win[1]) >= 0) return null;
  return rootNear(f, sloped, win[0], win[1], 1e-10, guess);
}
