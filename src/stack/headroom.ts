import type { StackDevice } from './types.js';
import { bisectionAnswer, type Trial } from '../numeric/bisection-answer.js';
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

/**
 * The bisection between a failing sample `below` and a holding sample `above`, to the resolution: the upper end of
 * the bisection cell where the targets start to hold, found by bisectionAnswer (regula falsi on the margin over the
 * bisection's own grid: the answer solving every midpoint gives when the targets fail below one crossing and hold
 * above it, in fewer DC solves; src/numeric/bisection-answer.ts). `known`, a sample solved anyway, narrows the
 * bracket when it lies inside. The reported headroom is always a solved point where the targets hold.
 */
function crossing(devices: readonly StackDevice[], gates: readonly number[], below: CurveSample, above: CurveSample, t: HeadroomTarget, known?: CurveSample): HeadroomPoint {
  const at = (s: CurveSample): Trial<CurveSample> => ({ x: s.v, holds: holds(s, t), margin: margin(s, t), sample: s });
  // Each solve starts from the nearer solved end.
  const solve = (x: number, hold: Trial<CurveSample>, fail: Trial<CurveSample>): Trial<CurveSample> => {
    const guess = (Math.abs(x - fail.x) < Math.abs(hold.x - x) && fail.sample.op) || hold.sample.op;
    return at(sampleAt(devices, gates, x, guess ?? undefined));
  };
  const r = bisectionAnswer(at(above), at(below), t.resolution ?? 1e-3, solve, known ? at(known) : undefined);
  return { v: r.x, sample: r.sample };
}

/** How far the targets hold at a sample: the smaller of Rout/target − 1 and the current-window margin; NaN when not covered. */
function margin(s: CurveSample, t: HeadroomTarget): number {
  if (s.op === null) return NaN;
  return Math.min(s.rout / t.rout - 1, currentMargin(s.i, t.iMid));
}
