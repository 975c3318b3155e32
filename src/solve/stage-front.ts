import type { StageFrontPoint } from './stage-types.js';

/** a dominates b: no lower gain or swing and no larger area, strictly better in one. */
function dominates(a: StageFrontPoint, b: StageFrontPoint): boolean {
  const noWorse = a.gain >= b.gain && a.swing >= b.swing && a.area <= b.area;
  return noWorse && (a.gain > b.gain || a.swing > b.swing || a.area < b.area);
}

/** Non-dominated explored designs over (gain ↑, swing ↑, area ↓), sorted by swing; designs without swing are left out. */
export function paretoStages(points: readonly StageFrontPoint[]): StageFrontPoint[] {
  const ok = points.filter((p) => p.swing > 0 && Number.isFinite(p.gain) && p.gain > 0 && p.area > 0);
  return ok.filter((p) => !ok.some((q) => q !== p && dominates(q, p))).sort((a, b) => a.swing - b.swing || b.gain - a.gain);
}
