/**
 * Starting a sizing worker thread. Kept free of the sizing code so the CLI can
 * start one before it loads that code: the worker's module loading then runs
 * beside the main thread's.
 */
import { createRequire } from 'node:module';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';

/**
 * The worker entry beside this module, with this module's extension: .ts when
 * run from source (tsx, tests), .js from tsc's dist/src, .mjs in the CLI bundle
 * beside the CommonJS CLI bundle (scripts/bundle-cli.ts writes size-worker.mjs next to it).
 */
export function sizeWorkerUrl(here: string = import.meta.url): URL {
  const ext = /\.(ts|mts|js|mjs|cjs)$/.exec(new URL(here).pathname)?.[1] ?? 'js';
  return new URL(`./size-worker.${ext === 'cjs' ? 'mjs' : ext}`, here);
}

/**
 * A sizing worker, waiting for its share (see parallel.ts). Unreferenced until
 * given work, so an unused one never keeps the process alive.
 */
export function startSizeWorker(): Worker {
  const url = sizeWorkerUrl();
  const worker = url.pathname.endsWith('ts') ? new Worker(fromSource(url), { eval: true }) : new Worker(url);
  worker.unref();
  // A failure before any work is given is kept and surfaces when the share is run (parallel.ts), never as an uncaught event.
  worker.on('error', (e: Error) => gone.set(worker, `failed: ${e.message}`));
  worker.on('exit', (code) => gone.has(worker) || gone.set(worker, `stopped (exit ${code})`));
  return worker;
}

const gone = new WeakMap<Worker, string>();

/** Why a started worker can take no work (it failed or stopped), or undefined while it can. */
export function workerGone(worker: Worker): string | undefined {
  return gone.get(worker);
}

/**
 * Run from source (tsx, tests), the worker loads TypeScript through tsx's
 * require hook: on Node 20 a worker inherits no ESM loader hooks, and cannot
 * register them for its own entry.
 */
function fromSource(entry: URL): string {
  const hook = createRequire(import.meta.url).resolve('tsx/cjs');
  return `require(${JSON.stringify(hook)}); require(${JSON.stringify(fileURLToPath(entry))});`;
}
