import type { StackSpec } from '../spec/types.js';
import type { Miss, SimulatedFigures } from './types.js';

/** Allowed relative deviation of the simulated current from the target (the README's 1 % window). */
export const CURRENT_TOLERANCE = 0.01;

/**
 * Targets one corner's simulation misses: the current more than 1 % off; the
 * headroom above target (Rout or the current window reached only higher up);
 * Rout when the targets never hold up to span (achieved: the lowest Rout over
 * [headroom target, span] and where it is).
 */
export function stackMisses(spec: Pick<StackSpec, 'current' | 'rout' | 'headroom'>, f: SimulatedFigures & { routAt?: number }): Miss[] {
  const out: Miss[] = [];
  if (!(Math.abs(f.iout / spec.current - 1) <= CURRENT_TOLERANCE)) out.push({ target: 'iout', required: spec.current, achieved: f.iout, corner: f.corner });
  if (Number.isFinite(f.headroom) || f.routAtTarget >= spec.rout) {
    if (!(f.headroom <= spec.headroom)) out.push({ target: 'headroom', required: spec.headroom, achieved: f.headroom, corner: f.corner });
  } else {
    const m: Miss = { target: 'rout', required: spec.rout, achieved: f.routAtTarget, corner: f.corner };
    if (f.routAt !== undefined) m.at = f.routAt;
    out.push(m);
  }
  return out;
}
