import type { StageOption } from './types.js';

/** A run of consecutive options of one channel length, with its best case for the screen's pools. */
export interface Run {
  start: number;
  end: number;
  area: number;
  ro: number;
  sigma: number;
  vgs: number;
}

// Longest run: shorter runs bound tighter, more runs cost more bounds (8 rates least on the demo specs).
const RUN = 8;

/**
 * Options split into runs of equal length (at most RUN long), in list order.
 * Options of one length carry nearly the same ro (about VA/I), so a run's best
 * case is close to each member's and a run that cannot enter a pool is skipped whole.
 */
export function runsByLength(options: readonly StageOption[]): Run[] {
  const runs: Run[] = [];
  let r: Run | undefined;
  for (let j = 0; j < options.length; j++) {
    const o = options[j];
    if (!r || o.l !== options[r.start].l || j - r.start >= RUN) runs.push((r = { start: j, end: j, area: Infinity, ro: -Infinity, sigma: Infinity, vgs: Infinity }));
    r.end = j + 1;
    if (o.area < r.area) r.area = o.area;
    if (o.ro > r.ro) r.ro = o.ro;
    if (o.sigma < r.sigma) r.sigma = o.sigma;
    if (o.vgs < r.vgs) r.vgs = o.vgs;
  }
  return runs;
}
