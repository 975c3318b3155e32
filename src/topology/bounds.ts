import type { StageOption } from './types.js';

/** Best case of a group of options for the screen's pools: smallest area, largest ro, smallest σ and VGS. */
export interface OptionBounds {
  area: number;
  ro: number;
  sigma: number;
  vgs: number;
}

/** Bounds of a non-empty group (each taken over the group: no single option need reach them all). */
export function bounds(options: readonly StageOption[]): OptionBounds {
  let area = Infinity;
  let ro = -Infinity;
  let sigma = Infinity;
  let vgs = Infinity;
  for (let j = 0; j < options.length; j++) {
    const o = options[j];
    if (o.area < area) area = o.area;
    if (o.ro > ro) ro = o.ro;
    if (o.sigma < sigma) sigma = o.sigma;
    if (o.vgs < vgs) vgs = o.vgs;
  }
  return { area, ro, sigma, vgs };
}
