import type { Objective, StackSpec } from '../design/types.js';
import type { SizeResult, StackResult } from './types.js';

/** Better by the spec's objective: smaller area, lower headroom or higher Rout (then smaller area). */
function better(objective: Objective, a: StackResult, b: StackResult): boolean {
  const pa = a.predicted;
  const pb = b.predicted;
  if (objective === 'headroom' && pa.headroom !== pb.headroom) return pa.headroom < pb.headroom;
  if (objective === 'rout' && pa.rout !== pb.rout) return pa.rout > pb.rout;
  return pa.area < pb.area;
}

/**
 * How far an infeasible result is from its targets: decades of Rout missing plus
 * headroom excess relative to the target (a never-met headroom counts as far).
 */
export function shortfall(r: StackResult, spec: StackSpec): number {
  const p = r.predicted;
  const rout = p.rout > 0 ? Math.max(0, Math.log10(spec.rout / p.rout)) : 10;
  const head = Number.isFinite(p.headroom) ? Math.max(0, (p.headroom - spec.headroom) / spec.headroom) : 10;
  const sigma = spec.mismatch !== undefined && p.sigma !== undefined ? Math.max(0, p.sigma / spec.mismatch - 1) : 0;
  return rout + head + sigma;
}

/**
 * Of the results one stack got (one per topology tried), the one to use: the
 * best feasible by the objective, else the nearest infeasible one.
 */
export function chooseResult(results: readonly StackResult[], spec: StackSpec): StackResult {
  let best: StackResult | undefined;
  for (const r of results) if (r.feasible && (!best || better(spec.objective, r, best))) best = r;
  if (best) return best;
  return results.reduce((a, b) => (shortfall(b, spec) < shortfall(a, spec) ? b : a));
}

/** Results that decide feasibility: every stack's chosen (or only) result. */
export function decidingResults(result: SizeResult): StackResult[] {
  return result.stacks.filter((s) => s.chosen !== false);
}
