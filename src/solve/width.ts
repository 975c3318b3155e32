import type { StackSpec } from '../design/types.js';

/** Fingers one device may be split into, by default (common practice: a few tens of fingers per device). */
export const MAX_FINGERS = 64;
/** Widest finger by default, as a multiple of the kit's shortest length (common practice: fingers of some ten µm). */
export const FINGER_PER_LMIN = 100;

/**
 * Widest drawn device a stack may use, m: the spec's `wmax`, else the kit's default,
 * MAX_FINGERS fingers of FINGER_PER_LMIN × the shortest table length each
 * (1.15 mm for a 0.18 µm kit). A wider design is infeasible with target `width`.
 */
export function widthLimit(spec: Pick<StackSpec, 'wmax'>, lmin: number): number {
  return spec.wmax ?? MAX_FINGERS * FINGER_PER_LMIN * lmin;
}
