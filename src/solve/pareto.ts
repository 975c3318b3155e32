import { dominates, nonDominated } from '../numeric/pareto.js';
import type { Topology } from '../design/types.js';

/** One exactly evaluated design on the trade-off front. */
export interface FrontPoint {
  topology: Topology;
  /** Provided headroom, V. */
  headroom: number;
  /** Lowest Rout over [headroom, span], Ω. */
  rout: number;
  /** Output-stack area ΣW·L, m². */
  area: number;
  /** Meets every target of its spec (all corners). */
  feasible: boolean;
  /** Per device from the rail outwards. */
  devices: Array<{ l: number; gmid: number; w: number }>;
  /** VDS setpoints of the lower devices, V. */
  setpoints: number[];
}

// Headroom ↓, Rout ↑, area ↓ as criteria to minimise.
const criteria = (p: FrontPoint): number[] => [p.headroom, -p.rout, p.area];

/** a dominates b: no worse in headroom, Rout and area, and strictly better in one. */
export function frontDominates(a: FrontPoint, b: FrontPoint): boolean {
  return dominates(criteria(a), criteria(b));
}

/**
 * Non-dominated set over (headroom ↓, rout ↑, area ↓), sorted by headroom.
 * Points with infinite headroom or NaN values are left out.
 */
export function paretoFront(candidates: readonly FrontPoint[]): FrontPoint[] {
  const pts = candidates
    .filter((p) => Number.isFinite(p.headroom) && Number.isFinite(p.area) && p.rout > 0)
    .sort((a, b) => a.headroom - b.headroom || b.rout - a.rout || a.area - b.area);
  // Equal points are kept once (the first in this order).
  const distinct = pts.filter((p, j) => j === 0 || !(pts[j - 1].headroom === p.headroom && pts[j - 1].rout === p.rout && pts[j - 1].area === p.area));
  return nonDominated(distinct, criteria);
}
