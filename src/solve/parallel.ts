/**
 * Sizing a spec on several threads: its stacks and stages are sized
 * independently, so they are split by estimated cost (parallel-plan.ts)
 * between this thread and worker threads, and put back together in spec order
 * (parallel-assemble.ts). The result is the one sizeSpec gives, byte for byte;
 * so is an error (the first one in spec order, as serial sizing meets it).
 */
import type { Worker } from 'node:worker_threads';
import { availableParallelism } from 'node:os';
import { StackwrightError } from '../errors.js';
import type { DesignSpec } from '../design/types.js';
import type { KitAccess } from './kit.js';
import { checkDesign, sizeSpec, type SizeRun } from './size.js';
import { sizeItems, splitItems, threadsFor } from './parallel-plan.js';
import { assembleRun } from './parallel-assemble.js';
import { fromWire } from './parallel-error.js';
import { sizeShare, type ShareOutcome } from './parallel-share.js';
import { startSizeWorker, workerGone } from './size-worker-start.js';
import type { ShareRequest } from './size-worker.js';

export interface ParallelOptions {
  /** Threads to size with, this one included (1: serial). Default: the available cores. Never more than the items. */
  jobs?: number;
  /** Workers already started (startSizeWorker), used before new ones are started; unused ones are stopped. */
  workers?: Worker[];
}

/** The share's outcome from a worker; a worker that dies instead is an internal error. */
function runOnWorker(worker: Worker, req: ShareRequest): Promise<ShareOutcome> {
  return new Promise((resolve, reject) => {
    const fail = (why: string) => reject(new StackwrightError(`size worker ${why}`, { kind: 'internal' }));
    const early = workerGone(worker);
    if (early) return fail(`${early} before its share was given`);
    worker.ref();
    worker.once('message', (m: ShareOutcome) => resolve(m));
    worker.once('error', (e: Error) => fail(`failed: ${e.message}`));
    worker.once('exit', (code) => fail(`stopped (exit ${code}) before its share was sized`));
    worker.postMessage(req);
  });
}

/**
 * sizeSpec on several threads. Needs the kit's folder (`dir`, as loadKit gives)
 * so workers can read the same tables; without it, or with one thread, sizes
 * here serially.
 *
 * @example const run = await sizeSpecParallel(spec, loadKit(spec.kit), { jobs: 2 });
 */
export async function sizeSpecParallel(spec: DesignSpec, kit: KitAccess & { dir?: string }, opts: ParallelOptions = {}): Promise<SizeRun> {
  const spare = [...(opts.workers ?? [])];
  const used: Worker[] = [];
  try {
    // Refuse bad input before any search, as sizeDesign does; the resolved corners weigh each item's cost.
    const items = sizeItems(spec, checkDesign(spec, kit).length);
    const threads = threadsFor(items.length, availableParallelism(), opts.jobs);
    if (threads <= 1 || kit.dir === undefined) return sizeSpec(spec, kit);
    const [mine, ...theirs] = splitItems(items, threads);
    const remote = theirs.map((positions) => {
      const worker = spare.shift() ?? startSizeWorker();
      used.push(worker);
      return runOnWorker(worker, { design: spec, tables: kit.dir as string, items, positions });
    });
    const local = sizeShare(spec, items, mine, () => kit);
    const outcomes = [local, ...(await Promise.all(remote))];
    const errors = outcomes.flatMap((o) => (o.error ? [o.error] : [])).sort((a, b) => a.position - b.position);
    if (errors.length > 0) throw fromWire(errors[0].error);
    const runs = outcomes.flatMap((o) => o.runs).sort((a, b) => a[0] - b[0]).map(([, r]) => r);
    return assembleRun(spec, runs);
  } finally {
    // Done with, failed or never used: none may keep the process alive.
    for (const w of [...spare, ...used]) void w.terminate();
  }
}
