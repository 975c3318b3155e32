import type { StackDevice, StackOp } from './types.js';
import { sampleAt, type CurveSample } from './curve.js';
import { currentMargin } from '../policy.js';

/** What "the targets hold at v" means for headroom. */
export interface HeadroomTarget {
  /** Minimum Rout, Ω. */
  rout: number;
  /** Current at mid-span, A: the reference for the 1 % current window. */
  iMid: number;
  /** Bisection resolution, V (default 1 mV). */
  resolution?: number;
}

/** True when Rout and the current window both hold at this sample. */
export function holds(s: CurveSample, t: HeadroomTarget): boolean {
  return s.op !== null && s.rout >= t.rout && currentMargin(s.i, t.iMid) >= 0;
}

/**
 * Lowest v such that the targets hold on every scanned point of [v, span]:
 * scan the curve down from the top, then bisect between the last failing and
 * first passing points to `resolution`. Infinity when they fail at the top.
 */
export function findHeadroom(devices: readonly StackDevice[], gates: readonly number[], curve: readonly CurveSample[], t: HeadroomTarget): number {
  return headroomPoint(devices, gates, curve, t).v;
}

/** The headroom and the solved sample there (null when it is a curve point's or Infinity). */
export interface HeadroomPoint {
  v: number;
  sample: CurveSample | null;
}

/**
 * findHeadroom, also giving the sample solved at the answer, so callers need not solve it again.
 * `known` is a sample the caller solved anyway (Rout at the target headroom): between the curve points
 * the search starts from, it narrows the bracket for free.
 */
export function headroomPoint(devices: readonly StackDevice[], gates: readonly number[], curve: readonly CurveSample[], t: HeadroomTarget, known?: CurveSample): HeadroomPoint {
  const last = curve.length - 1;
  if (last < 0 || !holds(curve[last], t)) return { v: Infinity, sample: null };
  let j = last;
  while (j > 0 && holds(curve[j - 1], t)) j--;
  if (j === 0) return { v: curve[0].v, sample: curve[0] };
  return crossing(devices, gates, curve[j - 1], curve[j], t, known);
}

// Guessed probes before the probes fall back to the open midpoint (a plain bisection of a 0.1 V gap to 1 mV takes 7).
const GUESSES = 8;
// Probes shrink the bracket strictly on a finite grid, so this only guards against a grid the replay cannot reach.
const MAX_PROBES = 64;

/**
 * The bisection between a failing sample `below` and a holding sample `above`, to the resolution: the
 * answer is the upper end of the bisection cell where the targets start to hold. Instead of solving at
 * every midpoint, each probe solves at a point of that same bisection grid near where the margin crosses
 * zero (secant through the latest two solves, else Illinois regula falsi on the bracket: common practice
 * for bracketed roots), and the bisection is replayed with midpoints at or below a failing probe taken as
 * failing and at or above a holding probe as holding. Once the replay needs no undecided midpoint, its
 * answer is a probe that holds with a failing one a grid step below: the answer solving every midpoint
 * gives (when the targets fail below the crossing and hold above it), in fewer DC solves. The reported
 * headroom is always a solved point where the targets hold.
 */
function crossing(devices: readonly StackDevice[], gates: readonly number[], below: CurveSample, above: CurveSample, t: HeadroomTarget, known?: CurveSample): HeadroomPoint {
  const res = t.resolution ?? 1e-3;
  const v0 = below.v;
  const v1 = above.v;
  // Highest solved failing sample and lowest solved holding sample, with the margins regula falsi uses.
  let fail = below;
  let hold = above;
  let mFail = margin(below, t);
  let mHold = margin(above, t);
  let side = 0;
  // The two latest solves, for the secant.
  let xa = below.v;
  let ma = mFail;
  let xb = above.v;
  let mb = mHold;
  if (known && known.v > v0 && known.v < v1) {
    const m = margin(known, t);
    xa = xb;
    ma = mb;
    if (holds(known, t)) {
      hold = known;
      mHold = m;
    } else {
      fail = known;
      mFail = m;
    }
    xb = known.v;
    mb = m;
  }
  for (let probes = 0; probes < MAX_PROBES; probes++) {
    let lo = v0;
    let hi = v1;
    let open = NaN;
    while (hi - lo > res) {
      const mid = 0.5 * (lo + hi);
      if (mid <= fail.v) lo = mid;
      else if (mid >= hold.v) hi = mid;
      else {
        open = mid;
        break;
      }
    }
    if (Number.isNaN(open)) {
      if (hi === hold.v) return { v: hi, sample: hold };
      // The answer lies above a holding point that is off the grid (the known sample): solve it to report it.
      if (!(hi > hold.v) || probes >= GUESSES) break;
      const s = sampleAt(devices, gates, hi, hold.op ?? undefined);
      if (!holds(s, t)) break;
      return { v: hi, sample: s };
    }
    // The probe: the grid point nearest the estimate (secant through the latest two solves, else regula
    // falsi on the bracket), or the other end of its cell when that one is known; the open midpoint without an estimate.
    let p = open;
    let est = (xa * mb - xb * ma) / (mb - ma);
    if (!(est > fail.v && est < hold.v)) est = (fail.v * mHold - hold.v * mFail) / (mHold - mFail);
    if (probes < GUESSES && est > fail.v && est < hold.v) {
      let a = lo;
      let b = hi;
      while (b - a > res) {
        const mid = 0.5 * (a + b);
        if (mid < est) a = mid;
        else b = mid;
      }
      if (a > fail.v && b < hold.v) p = est - a < b - est ? a : b;
      else if (b < hold.v) p = b;
      else if (a > fail.v) p = a;
    }
    const guess = (p - fail.v < hold.v - p && fail.op) || hold.op;
    const s = sampleAt(devices, gates, p, guess ?? undefined);
    const m = margin(s, t);
    xa = xb;
    ma = mb;
    xb = p;
    mb = m;
    if (holds(s, t)) {
      hold = s;
      mHold = m;
      // Illinois: the other end kept twice in a row weighs half.
      if (side === 1) mFail *= 0.5;
      side = 1;
    } else {
      fail = s;
      mFail = m;
      if (side === -1) mHold *= 0.5;
      side = -1;
    }
  }
  // Not settled (the targets do not fail below and hold above one crossing): the plain bisection decides.
  return bisect(devices, gates, below, above, t);
}

/** How far the targets hold at a sample: the smaller of Rout/target − 1 and the current-window margin; NaN when not covered. */
function margin(s: CurveSample, t: HeadroomTarget): number {
  if (s.op === null) return NaN;
  return Math.min(s.rout / t.rout - 1, currentMargin(s.i, t.iMid));
}

/** The plain bisection: a DC solve at every midpoint. */
function bisect(devices: readonly StackDevice[], gates: readonly number[], below: CurveSample, above: CurveSample, t: HeadroomTarget): HeadroomPoint {
  let lo = below.v;
  let hi = above.v;
  let at = above;
  let guess: StackOp = above.op!;
  const res = t.resolution ?? 1e-3;
  while (hi - lo > res) {
    const mid = 0.5 * (lo + hi);
    const s = sampleAt(devices, gates, mid, guess);
    if (holds(s, t)) {
      hi = mid;
      at = s;
      guess = s.op!;
    } else lo = mid;
  }
  return { v: hi, sample: at };
}
