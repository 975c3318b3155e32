import type { StackSpec } from '../spec/types.js';
import type { Miss, SimulatedFigures } from './types.js';

/** Allowed relative deviation of the simulated current from the target (the README's 1 % window). */
export const CURRENT_TOLERANCE = 0.01;

/**
 * Targets one corner's simulation misses: the current more than 1 % off,
 * Rout below target somewhere in [headroom, span], or (Rout met) the headroom
 * above target because the current leaves its window.
 */
export function stackMisses(spec: Pick<StackSpec, 'current' | 'rout' | 'headroom'>, f: SimulatedFigures & { routAt?: number }): Miss[] {
  const out: Miss[] = [];
  if (!(Math.abs(f.iout / spec.current - 1) <= CURRENT_TOLERANCE)) out.push({ target: 'iout', required: spec.current, achieved: f.iout, corner: f.corner });
  if (!(f.routAtTarget >= spec.rout)) {
    const m: Miss = { target: 'rout', required: spec.rout, achieved: f.routAtTarget, corner: f.corner };
    if (f.routAt !== undefined) m.at = f.routAt;
    out.push(m);
  } else if (!(f.headroom <= spec.headroom)) out.push({ target: 'headroom', required: spec.headroom, achieved: f.headroom, corner: f.corner });
  return out;
}
