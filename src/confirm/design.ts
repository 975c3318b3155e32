import type { DesignSpec } from '../design/types.js';
import type { SizeResult } from '../solve/types.js';
import type { KitAccess } from '../solve/kit.js';
import { decidingResults } from '../solve/choose.js';
import { decidingStages } from '../solve/stage-choose.js';
import { confirmItems, type ConfirmOptions } from './confirm.js';
import type { ConfirmItem } from './hook.js';
import { stackItem } from './stack-item.js';
import { stageItem } from './stage-item.js';
import type { StageConfirmation } from './stage-types.js';
import type { Confirmation } from './types.js';

export interface DesignConfirmInput {
  spec: DesignSpec;
  result: SizeResult;
  kit: KitAccess;
  models: { n: string; p: string };
}

/**
 * Confirm every chosen stack and gain stage of a sizing run in ngspice, all
 * of them as independent circuits of the same decks (one per corner and round).
 */
export async function confirmDesign(
  inp: DesignConfirmInput,
  opts: Omit<ConfirmOptions, 'corners' | 'supply'>,
): Promise<{ stacks: Confirmation[]; stages: StageConfirmation[] }> {
  const supply = inp.result.supply;
  const stacks = decidingResults(inp.result)
    .filter((r) => r.devices.length > 0)
    .map((r) => stackItem(r, inp.spec.stacks.find((s) => s.name === r.name)!, { kit: inp.kit, supply, models: inp.models, nominal: inp.result.corners[0] }));
  const stages = decidingStages(inp.result)
    .filter((r) => r.input.devices.length > 0 && r.load.devices.length > 0)
    .map((r) => stageItem(r, (inp.spec.stages ?? []).find((s) => s.name === r.name)!, { kit: inp.kit, supply, models: inp.models }));
  if (stacks.length + stages.length === 0) return { stacks: [], stages: [] };
  // One batch for both kinds: the loop only needs each item's own figure and outcome types to agree with itself.
  const items = [...stacks, ...stages] as unknown as ConfirmItem<{ corner: string }, Confirmation | StageConfirmation>[];
  const all = await confirmItems(items, { ...opts, corners: inp.result.corners, supply });
  return { stacks: all.slice(0, stacks.length) as Confirmation[], stages: all.slice(stacks.length) as StageConfirmation[] };
}
