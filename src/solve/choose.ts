import type { StackSpec } from '../design/types.js';
import { VOLT_SCALE, distanceToFeasible, marginsFor, objectiveCompare } from '../policy.js';
import type { SizeResult, StackResult } from './types.js';

/**
 * How far an infeasible result is from its targets, by the same rule the
 * search ranks designs with (policy.distanceToFeasible) on its predicted values.
 */
export function shortfall(r: StackResult, spec: StackSpec): number {
  const p = r.predicted;
  const b = r.binding;
  // Only a saturation verdict says how far the lower devices are from saturation.
  const saturation = b?.target !== 'saturation' ? Infinity : b.achieved !== null && b.required !== null ? (b.achieved - b.required) / VOLT_SCALE : -Infinity;
  return distanceToFeasible(marginsFor(spec, { rout: p.rout, headroom: p.headroom, iout: p.iout, sigma: p.sigma, saturation }));
}

/**
 * Of the results one stack got (one per topology tried), the one to use: the
 * best feasible by the objective, else the nearest infeasible one.
 */
export function chooseResult(results: readonly StackResult[], spec: StackSpec): StackResult {
  let best: StackResult | undefined;
  for (const r of results) if (r.feasible && (!best || objectiveCompare(spec.objective, r.predicted, best.predicted) < 0)) best = r;
  if (best) return best;
  return results.reduce((a, b) => (shortfall(b, spec) < shortfall(a, spec) ? b : a));
}

/** Results that decide feasibility: every stack's chosen (or only) result. */
export function decidingResults(result: SizeResult): StackResult[] {
  return result.stacks.filter((s) => s.chosen !== false);
}
