import type { DesignSpec } from '../design/types.js';
import type { SizeResult } from '../solve/types.js';
import type { KitAccess } from '../solve/kit.js';
import { decidingResults } from '../solve/choose.js';
import { confirmItems, type ConfirmOptions } from './confirm.js';
import { stackItem } from './stack-item.js';
import type { Confirmation } from './types.js';

export interface StackConfirmInput {
  spec: DesignSpec;
  result: SizeResult;
  kit: KitAccess;
  models: { n: string; p: string };
}

/**
 * Confirm every chosen stack design of a sizing run in ngspice (those the
 * tables could size at all), at every corner of the run. Returns one
 * confirmation per stack simulated, in spec order.
 */
export async function confirmStacks(inp: StackConfirmInput, opts: Omit<ConfirmOptions, 'corners' | 'supply'>): Promise<Confirmation[]> {
  const ctx = { kit: inp.kit, supply: inp.result.supply, models: inp.models, nominal: inp.result.corners[0] };
  const items = decidingResults(inp.result)
    .filter((r) => r.devices.length > 0)
    .map((r) => stackItem(r, inp.spec.stacks.find((s) => s.name === r.name)!, ctx));
  if (items.length === 0) return [];
  return confirmItems(items, { ...opts, corners: inp.result.corners, supply: inp.result.supply });
}
