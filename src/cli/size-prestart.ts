/**
 * `size` starts its first sizing worker before it loads the sizing code or reads
 * the spec, so the worker's start-up runs beside the main thread's. Only when
 * more than one thread is asked for (`--jobs N`, N > 1; one thread is the default),
 * not for help, not on one core.
 */
import type { Worker } from 'node:worker_threads';
import { availableParallelism } from 'node:os';
import { startSizeWorker } from '../solve/size-worker-start.js';

let early: Worker | undefined;

/** The --jobs value as written on the command line, if any. */
export function jobsArg(argv: readonly string[]): string | undefined {
  let v: string | undefined;
  argv.forEach((a, i) => {
    if (a === '--jobs') v = argv[i + 1];
    else if (a.startsWith('--jobs=')) v = a.slice('--jobs='.length);
  });
  return v;
}

/** Whether a `size` command line may size on more than one thread. */
export function mayUseWorkers(argv: readonly string[], cores: number): boolean {
  if (cores <= 1 || argv.includes('--help') || argv.includes('-h')) return false;
  const j = jobsArg(argv);
  return j !== undefined && /^\d+$/.test(j) && Number(j) > 1;
}

export function prestartSizeWorker(argv: readonly string[]): void {
  if (early === undefined && mayUseWorkers(argv, availableParallelism())) early = startSizeWorker();
}

/** The early worker, once (the size command hands it to sizeSpecParallel, which stops it if unused). */
export function takeEarlyWorkers(): Worker[] {
  const w = early;
  early = undefined;
  return w ? [w] : [];
}
