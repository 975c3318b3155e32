import type { Objective } from '../design/types.js';
import type { SolveContext } from './context.js';
import { fullyOk, nominalOk, totalViolation, type Evaluated } from './evaluate.js';

// Ties: headroom within 1 mV, Rout within 1 %, are settled by the next measure.
const mv = (h: number) => (Number.isFinite(h) ? Math.round(h * 1000) : Infinity);
const pct = (r: number) => (r > 0 ? Math.floor(Math.log(r) / Math.log(1.01)) : -Infinity);

/** Objective order between two designs that both meet the targets (< 0: a is better). */
export function objectiveCompare(objective: Objective, a: Evaluated, b: Evaluated): number {
  const d = {
    area: a.area - b.area,
    headroom: mv(a.nominal.headroom) - mv(b.nominal.headroom),
    rout: pct(b.nominal.rout) - pct(a.nominal.rout),
  };
  const order: Array<keyof typeof d> =
    objective === 'area' ? ['area', 'headroom', 'rout'] : objective === 'headroom' ? ['headroom', 'area', 'rout'] : ['rout', 'area', 'headroom'];
  for (const k of order) {
    const x = d[k];
    if (k === 'area' ? Math.abs(x) > 1e-9 * Math.max(a.area, b.area) : x !== 0 && !Number.isNaN(x)) return x;
  }
  return 0;
}

/**
 * a better than b (b usually the incumbent): meeting every target at every
 * corner first, then the objective; otherwise the smaller shortfall. Corners
 * of a are only computed when a could win.
 */
export function better(ctx: SolveContext, a: Evaluated, b: Evaluated): boolean {
  const obj = ctx.spec.objective;
  if (nominalOk(b) && fullyOk(ctx, b)) return nominalOk(a) && objectiveCompare(obj, a, b) < 0 && fullyOk(ctx, a);
  if (nominalOk(a) && fullyOk(ctx, a)) return true;
  // Shortfalls within ~2 % of Rout (1 mV of headroom) tie, so the nearest design is not bought with huge area.
  const va = Math.round(totalViolation(a) / 0.02);
  const vb = Math.round(totalViolation(b) / 0.02);
  return va < vb || (va === vb && objectiveCompare(obj, a, b) < 0);
}

/**
 * Best of a pool: designs meeting the nominal targets in objective order,
 * checked at the other corners lazily; otherwise the one nearest to meeting them.
 */
export function pickBest(ctx: SolveContext, pool: readonly Evaluated[]): Evaluated | undefined {
  const ok = pool.filter(nominalOk).sort((a, b) => objectiveCompare(ctx.spec.objective, a, b));
  for (const e of ok) if (fullyOk(ctx, e)) return e;
  let best: Evaluated | undefined;
  for (const e of pool) if (!best || better(ctx, e, best)) best = e;
  return best;
}
