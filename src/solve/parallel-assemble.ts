/**
 * Putting a spec's sizing back together from its items sized apart (the whole-spec
 * checks before any item is sized are size.ts's checkDesign, shared with sizeDesign).
 */
import { StackwrightError } from '../errors.js';
import type { DesignSpec } from '../design/types.js';
import type { SizeRun } from './size.js';
import type { SizeResult } from './types.js';

/**
 * The run of the whole spec from the runs of its items (each from itemDesign),
 * given in spec order: the same objects, keys and order sizeSpec gives.
 */
export function assembleRun(design: DesignSpec, runs: readonly SizeRun[]): SizeRun {
  if (runs.length === 0) throw new StackwrightError('no sized items to assemble', { kind: 'internal' });
  const stacks: SizeResult['stacks'] = [];
  const stages: NonNullable<SizeResult['stages']> = [];
  const fronts: SizeRun['fronts'] = {};
  const stageFronts: NonNullable<SizeRun['stageFronts']> = {};
  for (const r of runs) {
    stacks.push(...r.result.stacks);
    stages.push(...(r.result.stages ?? []));
    Object.assign(fronts, r.fronts);
    Object.assign(stageFronts, r.stageFronts ?? {});
  }
  // The first item's result carries the spec-wide fields (kit, corners, supply, caution) in sizeDesign's key order.
  const result: SizeResult = { ...runs[0].result, stacks };
  if (!design.stages?.length) return { result, fronts };
  result.stages = stages;
  return { result, fronts, stageFronts };
}
