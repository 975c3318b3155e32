/**
 * Worker thread entry of parallel sizing (parallel.ts): waits for one share
 * (the spec, the tables folder, the items and which of them to size), loads
 * the kit from the same folder, sizes the share and posts the outcome back.
 */
import { parentPort } from 'node:worker_threads';
import type { DesignSpec } from '../design/types.js';
import { loadKit, type Kit } from './load-kit.js';
import type { SizeItem } from './parallel-plan.js';
import { sizeShare } from './parallel-share.js';

/** The message the main thread sends: one share. */
export interface ShareRequest {
  design: DesignSpec;
  /** Folder the main thread's kit came from. */
  tables: string;
  items: SizeItem[];
  positions: number[];
}

parentPort?.once('message', (req: ShareRequest) => {
  let kit: Kit | undefined;
  const outcome = sizeShare(req.design, req.items, req.positions, () => (kit ??= loadKit(req.design.kit, { tables: req.tables })));
  parentPort?.postMessage(outcome);
});
