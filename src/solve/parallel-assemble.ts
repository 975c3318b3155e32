/**
 * Putting a spec's sizing back together from its items sized apart, and the
 * checks sizeDesign makes on the whole spec before any search (so a parallel
 * run refuses bad input with the same message, before any item is sized).
 */
import { StackwrightError } from '../errors.js';
import { resolveCorners } from '../design/index.js';
import type { DesignSpec } from '../design/types.js';
import type { KitAccess } from './kit.js';
import { checkStageCover, checkTableCover } from './table-cover.js';
import type { SizeRun } from './size.js';
import type { SizeResult } from './types.js';

/** sizeDesign's checks of the whole spec, in its order (kit, corners, every stack's and stage's table cover). */
export function checkDesign(design: DesignSpec, kit: KitAccess): void {
  if (design.kit !== kit.kit) {
    throw new StackwrightError(`spec asks for kit "${design.kit}" but the tables are for "${kit.kit}"`, { where: `${design.file}: kit` });
  }
  const corners = resolveCorners(design, kit.corners);
  design.stacks.forEach((s, i) => checkTableCover(s, kit, corners, design.supply, `${design.file}: stacks[${i}]`));
  (design.stages ?? []).forEach((s) => checkStageCover(s, kit, corners, design.supply, `${design.file}: supply`));
}

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
