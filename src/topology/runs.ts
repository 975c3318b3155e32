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

/**
 * Options split into runs of at most `most` consecutive ones, in list order,
 * also split where the channel length changes when `sameLength` (options of
 * one length carry nearly the same ro, about VA/I, so a run's best case is
 * close to each member's). A run that cannot enter a pool is skipped whole;
 * shorter runs bound tighter but cost more bounds.
 */
export function runsOf(options: readonly StageOption[], most: number, sameLength: boolean): Run[] {
  const runs: Run[] = [];
  let r: Run | undefined;
  for (let j = 0; j < options.length; j++) {
    const o = options[j];
    if (!r || (sameLength && o.l !== options[r.start].l) || j - r.start >= most) runs.push((r = { start: j, end: j, area: Infinity, ro: -Infinity, sigma: Infinity, vgs: Infinity }));
    r.end = j + 1;
    if (o.area < r.area) r.area = o.area;
    if (o.ro > r.ro) r.ro = o.ro;
    if (o.sigma < r.sigma) r.sigma = o.sigma;
    if (o.vgs < r.vgs) r.vgs = o.vgs;
  }
  return runs;
}
