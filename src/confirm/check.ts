import type { StackSpec } from '../design/types.js';
import { CURRENT_WINDOW, midSpan } from '../policy.js';
import type { Miss, SimulatedFigures } from './types.js';

/**
 * Targets one corner's simulation misses: the current more than 1 % off; the
 * headroom above target (Rout or the current window reached only higher up);
 * Rout when the targets never hold up to span (achieved: the lowest Rout over
 * [headroom target, span] and where it is).
 */
export function stackMisses(spec: Pick<StackSpec, 'current' | 'rout' | 'headroom' | 'span'>, f: SimulatedFigures & { routAt?: number }): Miss[] {
  const out: Miss[] = [];
  const miss = (target: Miss['target'], required: number, achieved: number, at: number | null): Miss => ({
    target, required, achieved: Number.isFinite(achieved) ? achieved : null, at, device: null, corner: f.corner,
  });
  if (!(Math.abs(f.iout / spec.current - 1) <= CURRENT_WINDOW)) out.push(miss('iout', spec.current, f.iout, midSpan(spec)));
  if (Number.isFinite(f.headroom) || f.routAtTarget >= spec.rout) {
    if (!(f.headroom <= spec.headroom)) out.push(miss('headroom', spec.headroom, f.headroom, null));
  } else out.push(miss('rout', spec.rout, f.routAtTarget, f.routAt ?? null));
  return out;
}
