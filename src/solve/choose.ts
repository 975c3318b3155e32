import type { Objective } from '../spec/types.js';
import type { StackResult } from './types.js';

/** Better by the spec's objective: smaller area, lower headroom or higher Rout (then smaller area). */
function better(objective: Objective, a: StackResult, b: StackResult): boolean {
  const pa = a.predicted;
  const pb = b.predicted;
  if (objective === 'headroom' && pa.headroom !== pb.headroom) return pa.headroom < pb.headroom;
  if (objective === 'rout' && pa.rout !== pb.rout) return pa.rout > pb.rout;
  return pa.area < pb.area;
}

/**
 * Of the results one stack got (one per topology tried), the one to use: the
 * best feasible by the objective, else the first (nearest) infeasible one.
 */
export function chooseResult(results: readonly StackResult[], objective: Objective): StackResult {
  let best: StackResult | undefined;
  for (const r of results) if (r.feasible && (!best || better(objective, r, best))) best = r;
  return best ?? results[0];
}
