import { objectiveCompare, type Measures, type Objective } from '../../policy.js';
import type { SolveContext } from '../context.js';
import { ensureCorners, fullyOk, nominalOk, totalViolation, type Evaluated } from '../evaluate/evaluate.js';

/** The measures a design is ordered by (nominal corner). */
export function measuresOf(e: Evaluated): Measures {
  return { area: e.area, headroom: e.nominal.headroom, rout: e.nominal.rout };
}

/** Objective order between two evaluated designs (< 0: a is better); see policy.objectiveCompare. */
export function compareDesigns(objective: Objective, a: Evaluated, b: Evaluated): number {
  return objectiveCompare(objective, measuresOf(a), measuresOf(b));
}

// Shortfalls that round to the same multiple of this tie in `better`.
const SHORTFALL_STEP = 0.02;

/**
 * a better than b (b usually the incumbent): meeting every target at every
 * corner first, then the objective; otherwise the smaller shortfall summed
 * over every corner. Corners are computed on demand.
 */
export function better(ctx: SolveContext, a: Evaluated, b: Evaluated): boolean {
  const obj = ctx.spec.objective;
  if (fullyOk(ctx, b)) return nominalOk(a) && compareDesigns(obj, a, b) < 0 && fullyOk(ctx, a);
  if (fullyOk(ctx, a)) return true;
  // Neither meets everything: judge both by their shortfall at every corner, not only where it was computed,
  // or a nominal-only shortfall would look smaller than one that includes a corner's miss.
  // Shortfalls within ~2 % of Rout (1 mV of headroom) tie, so the nearest design is not bought with huge area.
  const va = Math.round(shortfall(ctx, a) / SHORTFALL_STEP);
  const vb = Math.round(shortfall(ctx, b) / SHORTFALL_STEP);
  return va < vb || (va === vb && compareDesigns(obj, a, b) < 0);
}

/** The largest shortfall that `better` still rounds to the same step as x (less a hair for rounding). */
export function stepTop(x: number): number {
  return (Math.round(x / SHORTFALL_STEP) + 0.5) * SHORTFALL_STEP + 1e-9;
}

/** Shortfall summed over every corner of the spec (computes the corners if needed). */
export function shortfall(ctx: SolveContext, e: Evaluated): number {
  ensureCorners(ctx, e);
  return totalViolation(e);
}

/**
 * Best of a pool: designs meeting the nominal targets in objective order,
 * checked at the other corners lazily; otherwise the one nearest to meeting them.
 */
export function pickBest(ctx: SolveContext, pool: readonly Evaluated[]): Evaluated | undefined {
  const ok = pool.filter(nominalOk).sort((a, b) => compareDesigns(ctx.spec.objective, a, b));
  for (const e of ok) if (fullyOk(ctx, e)) return e;
  let best: Evaluated | undefined;
  for (const e of pool) if (!best || better(ctx, e, best)) best = e;
  return best;
}
