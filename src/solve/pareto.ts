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

/** a dominates b: no worse in headroom, Rout and area, and strictly better in one. */
export function dominates(a: FrontPoint, b: FrontPoint): boolean {
  const noWorse = a.headroom <= b.headroom && a.rout >= b.rout && a.area <= b.area;
  const better = a.headroom < b.headroom || a.rout > b.rout || a.area < b.area;
  return noWorse && better;
}

/**
 * Non-dominated set over (headroom ↓, rout ↑, area ↓), sorted by headroom.
 * Points with infinite headroom or NaN values are left out.
 */
export function paretoFront(candidates: readonly FrontPoint[]): FrontPoint[] {
  const pts = candidates
    .filter((p) => Number.isFinite(p.headroom) && Number.isFinite(p.area) && p.rout > 0)
    .sort((a, b) => a.headroom - b.headroom || b.rout - a.rout || a.area - b.area);
  const front: FrontPoint[] = [];
  for (const p of pts) {
    if (front.some((q) => dominates(q, p) || (q.headroom === p.headroom && q.rout === p.rout && q.area === p.area))) continue;
    front.push(p);
  }
  return front.filter((p) => !front.some((q) => q !== p && dominates(q, p)));
}
