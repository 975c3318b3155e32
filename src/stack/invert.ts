import type { LengthSlice } from '../device/types.js';
import { fallingRoot } from '../numeric/illinois.js';
import { covers, within } from './range.js';

const s4 = new Float64Array(4);

/** gm/ID at a bias; +Infinity where the device carries no current (square-law cut-off). */
export function gmidAt(slice: LengthSlice, vgs: number, vds: number, vsb: number): number {
  // Only jd and gm are needed: a slice that can give just those skips gds and gmb.
  const s = slice.jdGm ? (slice.jdGm(vgs, vds, vsb, s4), s4) : slice.small(vgs, vds, vsb, s4);
  return s[0] > 0 ? s[1] / s[0] : Infinity;
}

/** VDS used for a gm/ID lookup: a fixed value, or 'diode' for VDS = VGS. */
export type VdsMode = number | 'diode';

function vdsOf(mode: VdsMode, vgs: number): number {
  return mode === 'diode' ? vgs : mode;
}

/** The VGS interval over which (vgs, vds(vgs), vsb) stays inside the table. */
export function vgsWindow(slice: LengthSlice, mode: VdsMode, vsb: number): [number, number] | null {
  const r = slice.range;
  let lo = r.vgs[0];
  let hi = r.vgs[1];
  if (mode === 'diode') {
    lo = Math.max(lo, r.vds[0]);
    hi = Math.min(hi, r.vds[1]);
  } else if (!covers(slice, lo, mode, vsb)) return null;
  if (!within(vsb, r.vsb) || hi <= lo) return null;
  return [lo, hi];
}

// Coarse enough to be cheap (gm/ID is monotone above weak inversion), fine enough not to step over a crossing.
const SCAN = 16;

/**
 * VGS at which gm/ID equals `target` at the given VDS (or diode) and VSB.
 * gm/ID falls with VGS above weak inversion, so scan down from the top of the
 * table for the first sample at or above the target, then bisect. Null when
 * the table does not reach the target.
 */
export function vgsForGmid(slice: LengthSlice, target: number, mode: VdsMode, vsb: number): number | null {
  // Memoised: candidates share most device biases (same L, gm/ID, setpoint), and the search is pure.
  let bySlice = solved.get(slice);
  if (!bySlice) solved.set(slice, (bySlice = new Map()));
  const m = mode === 'diode' ? -1 : mode;
  let byMode = bySlice.get(m);
  if (!byMode) bySlice.set(m, (byMode = new Map()));
  let byVsb = byMode.get(vsb);
  if (!byVsb) byMode.set(vsb, (byVsb = new Map()));
  let g = byVsb.get(target);
  if (g === undefined) {
    if (byVsb.size >= MEMO_LIMIT) byVsb.clear();
    byVsb.set(target, (g = searchVgsForGmid(slice, target, mode, vsb)));
  }
  return g;
}

// Per slice, per VDS (−1 for a diode), per VSB, per target gm/ID: numeric keys, no strings built per call.
const solved = new WeakMap<LengthSlice, Map<number, Map<number, Map<number, number | null>>>>();
// Bounds the memory one (slice, VDS, VSB) can hold when targets never repeat.
const MEMO_LIMIT = 4096;

function searchVgsForGmid(slice: LengthSlice, target: number, mode: VdsMode, vsb: number): number | null {
  const win = vgsWindow(slice, mode, vsb);
  if (!win) return null;
  // Indexed, not destructured: destructuring runs the iterator protocol (an allocation) in unoptimised code.
  const lo = win[0];
  const hi = win[1];
  const f = (vgs: number) => gmidAt(slice, vgs, vdsOf(mode, vgs), vsb) - target;
  let b = hi;
  if (f(b) >= 0) return null;
  let a = b;
  for (let j = SCAN - 1; j >= 0; j--) {
    a = lo + ((hi - lo) * j) / SCAN;
    if (f(a) >= 0) break;
    b = a;
    if (j === 0) return null;
  }
  return illinois(f, a, b, 1e-9);
}

/** Root of the falling f in [a, b] to `tol` (Illinois regula falsi: src/numeric/illinois.ts). */
export function illinois(f: (x: number) => number, a: number, b: number, tol: number): number {
  return fallingRoot({ at: f }, a, b, tol);
}

/**
 * VGS at which w·jd(vgs, vds, vsb) = i, jd rising with VGS (also for a diode,
 * where VDS = VGS). Null when the table does not reach the current.
 */
export function vgsForCurrent(slice: LengthSlice, w: number, i: number, mode: VdsMode, vsb: number): number | null {
  const win = vgsWindow(slice, mode, vsb);
  if (!win) return null;
  let a = win[0];
  let b = win[1];
  const f = (vgs: number) => w * slice.jd(vgs, vdsOf(mode, vgs), vsb) - i;
  if (f(b) < 0 || f(a) > 0) return null;
  for (let it = 0; it < 60 && b - a > 1e-12; it++) {
    const m = 0.5 * (a + b);
    if (f(m) < 0) a = m;
    else b = m;
  }
  return 0.5 * (a + b);
}
