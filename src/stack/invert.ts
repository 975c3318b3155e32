import type { LengthSlice } from '../device/types.js';
import { fallingRoot, type Falling } from '../numeric/illinois.js';
import { fallingNewton } from '../numeric/safe-newton.js';
import { CurrentLine } from './current-line.js';
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
 * table for the first sample at or above the target, then solve in between
 * (Illinois on log gm/ID: gm and jd are both interpolated geometrically along
 * VGS, so log gm/ID is linear within a table cell and the secant steps land on
 * the root in a few samples). Null when the table does not reach the target.
 */
export function vgsForGmid(slice: LengthSlice, target: number, mode: VdsMode, vsb: number): number | null {
  // Memoised: candidates share most device biases (same L, gm/ID, setpoint), and the search is pure.
  const at = biasMemo(slice, mode, vsb);
  let g = at.vgs.get(target);
  if (g === undefined) {
    if (at.vgs.size >= MEMO_LIMIT) at.vgs.clear();
    at.vgs.set(target, (g = searchVgsForGmid(slice, target, mode, vsb, at)));
  }
  return g;
}

/** What one (slice, VDS, VSB) has solved: VGS per target gm/ID, and the scan's gm/ID samples (any target's). */
interface BiasMemo {
  vgs: Map<number, number | null>;
  /** gm/ID at lo + (hi − lo)·j/SCAN, j = 0..SCAN, over the VGS window; null when there is no window. */
  scan: Float64Array | null | undefined;
  lo: number;
  hi: number;
}

// Per slice, per VDS (−1 for a diode), per VSB: numeric keys, no strings built per call.
const solved = new WeakMap<LengthSlice, Map<number, Map<number, BiasMemo>>>();
// Bounds the memory one (slice, VDS, VSB) can hold when targets never repeat.
const MEMO_LIMIT = 4096;

function biasMemo(slice: LengthSlice, mode: VdsMode, vsb: number): BiasMemo {
  let bySlice = solved.get(slice);
  if (!bySlice) solved.set(slice, (bySlice = new Map()));
  const m = mode === 'diode' ? -1 : mode;
  let byMode = bySlice.get(m);
  if (!byMode) bySlice.set(m, (byMode = new Map()));
  let memo = byMode.get(vsb);
  if (!memo) byMode.set(vsb, (memo = { vgs: new Map(), scan: undefined, lo: 0, hi: 0 }));
  return memo;
}

/** gm/ID at the scan's samples, taken once per (slice, VDS, VSB): the targets asked there share them. */
function scanOf(slice: LengthSlice, mode: VdsMode, vsb: number, memo: BiasMemo): Float64Array | null {
  if (memo.scan !== undefined) return memo.scan;
  const win = vgsWindow(slice, mode, vsb);
  if (!win) return (memo.scan = null);
  // Indexed, not destructured: destructuring runs the iterator protocol (an allocation) in unoptimised code.
  const lo = win[0];
  const hi = win[1];
  const scan = new Float64Array(SCAN + 1);
  for (let j = 0; j <= SCAN; j++) {
    const vgs = j === SCAN ? hi : lo + ((hi - lo) * j) / SCAN;
    scan[j] = gmidAt(slice, vgs, vdsOf(mode, vgs), vsb);
  }
  memo.lo = lo;
  memo.hi = hi;
  return (memo.scan = scan);
}

/** log(gm/ID / target) along VGS: falling where gm/ID does, +Infinity without current (as gmidAt). */
class GmidExcess implements Falling {
  slice: LengthSlice = null as unknown as LengthSlice;
  mode: VdsMode = 0;
  vsb = 0;
  target = 0;
  at(vgs: number): number {
    return Math.log(gmidAt(this.slice, vgs, vdsOf(this.mode, vgs), this.vsb) / this.target);
  }
}
const gmidExcess = new GmidExcess();

function searchVgsForGmid(slice: LengthSlice, target: number, mode: VdsMode, vsb: number, memo: BiasMemo): number | null {
  const scan = scanOf(slice, mode, vsb, memo);
  if (!scan) return null;
  const { lo, hi } = memo;
  if (scan[SCAN] >= target) return null;
  let j = SCAN - 1;
  while (j >= 0 && !(scan[j] >= target)) j--;
  if (j < 0) return null;
  const a = lo + ((hi - lo) * j) / SCAN;
  const b = j + 1 === SCAN ? hi : lo + ((hi - lo) * (j + 1)) / SCAN;
  const f = gmidExcess;
  f.slice = slice;
  f.mode = mode;
  f.vsb = vsb;
  f.target = target;
  return fallingRoot(f, a, b, 1e-9, Math.log(scan[j] / target), Math.log(scan[j + 1] / target));
}

// The current asked for over the device's, as its VGS rises (VDS fixed, or rising with it for a diode), as a log.
const shortfall = new CurrentLine();

/**
 * VGS at which w·jd(vgs, vds, vsb) = i, jd rising with VGS (also for a diode,
 * where VDS = VGS), to 1e-12 V. Null when the table does not reach the current.
 * Safeguarded Newton on log(i / (w·jd)), which is linear along VGS within a
 * table cell (jd is interpolated geometrically there): a few lookups where
 * bisection took about forty.
 */
export function vgsForCurrent(slice: LengthSlice, w: number, i: number, mode: VdsMode, vsb: number): number | null {
  const win = vgsWindow(slice, mode, vsb);
  if (!win) return null;
  const f = shortfall.of(slice, w, i, false, true).along(0, mode === 'diode' ? 0 : mode, vsb, 1, mode === 'diode' ? 1 : 0, 0);
  const fa = f.at(win[0]);
  const fb = f.at(win[1]);
  // The window's ends bracket the current (or it is out of reach); an end that carries exactly i is the answer.
  if (!(fb <= 0) || !(fa >= 0)) return null;
  if (fb === 0) return win[1];
  if (fa === 0) return win[0];
  const x = slice.jdSlopes ? fallingNewton(f, win[0], win[1], 1e-12, NaN) : NaN;
  return Number.isNaN(x) ? fallingRoot(f, win[0], win[1], 1e-12, fa, fb) : x;
}
