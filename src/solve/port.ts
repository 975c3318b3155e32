import type { DesignSpec } from '../design/types.js';
import type { Polarity } from '../table/types.js';
import type { CornerResult, StackResult } from './types.js';
import type { Kit } from './load-kit.js';
import { sizeSpec, type SizeRun } from './size.js';
import { specDecimal } from '../units/index.js';
import { decidingResults } from './choose.js';
import { compareResults, harderTargets, type Change, type Harder } from './compare.js';
import { evaluateAtCorner } from './evaluate/corners.js';
import type { StageCorner, StageResult } from './stage-types.js';
import { compareStages, harderStage, retargetStage, stageAsIs, type StageHarder } from './stage-port.js';
import { decidingStages } from './stage-choose.js';

export interface PortStack {
  name: string;
  from: StackResult;
  to: StackResult;
  changes: Change[];
  /** Targets that got harder on the new kit, as data (src/report makes the sentences). */
  harder: Harder[];
  /** The old sizes as they are, re-evaluated on the new kit's tables (gates from the old bias devices). */
  asIs: CornerResult | { error: string };
}

export interface PortStage {
  name: string;
  from: StageResult;
  to: StageResult;
  changes: Change[];
  /** Targets that got harder on the new kit, as data (src/report makes the sentences). */
  harder: StageHarder[];
  /** The old sizes as they are on the new kit (gates from the old bias devices, input re-solved). */
  asIs: StageCorner | { error: string };
}

export interface PortRun {
  from: SizeRun;
  to: SizeRun;
  /** Spec as re-targeted to the new kit (supply, spans). */
  toSpec: DesignSpec;
  notes: string[];
  stacks: PortStack[];
  /** Gain stages, when the spec has them. */
  stages: PortStage[];
}

/**
 * Re-size a spec on a new kit and compare. The new kit's supply is `supply`, else
 * the old one capped at the top of the new tables' vds axis; a span above the
 * new supply keeps its distance from the far rail (reported in `notes`).
 */
export function portSpec(spec: DesignSpec, from: Kit, to: Kit, opts: { supply?: number } = {}): PortRun {
  const notes: string[] = [];
  const vdsTop = Math.min(...(['n', 'p'] as Polarity[]).flatMap((d) => to.corners.flatMap((c) => {
    try {
      const ax = to.table(d, c).axes.vds;
      return [ax[ax.length - 1]];
    } catch {
      return [];
    }
  })));
  const supply = opts.supply ?? Math.min(spec.supply, vdsTop);
  if (supply !== spec.supply) notes.push(`supply ${spec.supply} V -> ${supply} V on kit ${to.kit}`);
  const stacks = spec.stacks.map((s) => {
    if (s.span <= supply) return s;
    let span = specDecimal(s.span - (spec.supply - supply));
    if (!(span > s.headroom + 0.05)) span = specDecimal((s.span * supply) / spec.supply);
    notes.push(`${s.name}: span ${s.span} V -> ${Number(span.toFixed(3))} V`);
    return { ...s, span };
  });
  const stages = spec.stages?.map((s) => {
    const t = retargetStage(s, spec.supply, supply);
    if (t !== s) notes.push(`${s.name}: output ${s.output} V -> ${Number(t.output.toFixed(3))} V, swing target ${s.swing} V -> ${Number(t.swing.toFixed(3))} V (same share of the supply)`);
    return t;
  });
  const fromSpec: DesignSpec = { ...spec, kit: from.kit };
  const toSpec: DesignSpec = { ...spec, kit: to.kit, supply, stacks };
  if (stages) toSpec.stages = stages;
  const runFrom = sizeSpec(fromSpec, from);
  const runTo = sizeSpec(toSpec, to);
  const chosen = (run: SizeRun, name: string): StackResult => decidingResults(run.result).find((r) => r.name === name) as StackResult;
  const compared = toSpec.stacks.map((s, i) => {
    const a = chosen(runFrom, s.name);
    const b = chosen(runTo, s.name);
    let asIs: PortStack['asIs'];
    try {
      asIs = evaluateAtCorner(a, s, to, runTo.result.corners[0], supply);
    } catch (e) {
      asIs = { error: (e as Error).message };
    }
    return { name: s.name, from: a, to: b, changes: compareResults(a, b), harder: harderTargets(spec.stacks[i], a, b), asIs };
  });
  const chosenStage = (run: SizeRun, name: string): StageResult => decidingStages(run.result).find((r) => r.name === name) as StageResult;
  const portedStages = (toSpec.stages ?? []).map((s, i): PortStage => {
    const a = chosenStage(runFrom, s.name);
    const b = chosenStage(runTo, s.name);
    const harder = harderStage((spec.stages ?? [])[i], s, a, b);
    return { name: s.name, from: a, to: b, changes: compareStages(a, b), harder, asIs: stageAsIs(a, s, to, runTo.result.corners[0], supply) };
  });
  return { from: runFrom, to: runTo, toSpec, notes, stacks: compared, stages: portedStages };
}
