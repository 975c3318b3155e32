/**
 * Sizing one share of a spec's items, on whichever thread runs it: each item on
 * its own (itemDesign) in spec order, stopping at the first error, which is
 * kept with the item's position so the caller can throw the one serial sizing
 * would have met first.
 */
import type { DesignSpec } from '../design/types.js';
import type { KitAccess } from './kit.js';
import { sizeSpec, type SizeRun } from './size.js';
import { itemDesign, type SizeItem } from './parallel-plan.js';
import { toWire, type WireError } from './parallel-error.js';

/** What a share gives back: runs by item position (spec order), and the error that stopped it. */
export interface ShareOutcome {
  runs: Array<[number, SizeRun]>;
  error?: { position: number; error: WireError };
}

/** A share of the items (positions into `items`, ascending), sized on `kit`. */
export function sizeShare(design: DesignSpec, items: readonly SizeItem[], positions: readonly number[], kit: () => KitAccess): ShareOutcome {
  const runs: ShareOutcome['runs'] = [];
  for (const position of positions) {
    try {
      runs.push([position, sizeSpec(itemDesign(design, items[position]), kit())]);
    } catch (e) {
      return { runs, error: { position, error: toWire(e) } };
    }
  }
  return { runs };
}
