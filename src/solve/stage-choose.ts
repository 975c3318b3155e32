import type { StageSpec } from '../design/types.js';
import type { StageResult } from './stage-types.js';

function better(spec: StageSpec, a: StageResult, b: StageResult): boolean {
  const pa = a.predicted;
  const pb = b.predicted;
  if (spec.objective === 'swing' && Math.round(pa.swing * 1000) !== Math.round(pb.swing * 1000)) return pa.swing > pb.swing;
  if (spec.objective === 'gain' && pa.gain !== pb.gain) return pa.gain > pb.gain;
  return pa.area < pb.area;
}

/** How far an infeasible result is from its targets: relative swing missing plus the gain shortfall in ln units. */
export function stageShortfall(r: StageResult, spec: StageSpec): number {
  if (r.load.devices.length === 0) return Infinity;
  const held = r.nearest?.gainAtSwing ?? r.predicted.gain;
  return Math.max(0, (spec.swing - r.predicted.swing) / spec.swing) + (held > 0 ? Math.max(0, Math.log(spec.gain / held)) : 50);
}

/** Of the results one stage got (one per load topology), the one to use: best feasible by the objective, else the nearest. */
export function chooseStage(results: readonly StageResult[], spec: StageSpec): StageResult {
  let best: StageResult | undefined;
  for (const r of results) if (r.feasible && (!best || better(spec, r, best))) best = r;
  if (best) return best;
  return results.reduce((a, b) => (stageShortfall(b, spec) < stageShortfall(a, spec) ? b : a));
}

/** Stages that decide feasibility: every stage's chosen (or only) result. */
export function decidingStages(result: { stages?: StageResult[] }): StageResult[] {
  return (result.stages ?? []).filter((s) => s.chosen !== false);
}
