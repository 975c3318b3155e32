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
  const last = curve.length - 1;
  if (last < 0 || !holds(curve[last], t)) return Infinity;
  let j = last;
  while (j > 0 && holds(curve[j - 1], t)) j--;
  if (j === 0) return curve[0].v;
  let lo = curve[j - 1].v;
  let hi = curve[j].v;
  let guess: StackOp = curve[j].op!;
  const res = t.resolution ?? 1e-3;
  while (hi - lo > res) {
    const mid = 0.5 * (lo + hi);
    const s = sampleAt(devices, gates, mid, guess);
    if (holds(s, t)) {
      hi = mid;
      guess = s.op!;
    } else lo = mid;
  }
  return hi;
}
