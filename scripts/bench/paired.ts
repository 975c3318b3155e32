/** Whole-process A/B timing: runs alternate A, B, A, B, ... so drift on a shared machine hits both alike. */
import { timeSpawn } from './spawn-time.js';
import { median } from './stats.js';

export interface Sample {
  /** Wall time of each run, ms, in run order. */
  ms: number[];
  median: number;
  min: number;
  max: number;
}

export interface Paired {
  a: Sample;
  b: Sample;
  /** median(b) / median(a). */
  ratio: number;
  /** Lowest and highest per-pair ratio b/a. */
  ratioRange: [number, number];
  pairs: number;
}

export function sample(ms: number[]): Sample {
  return { ms, median: median(ms), min: Math.min(...ms), max: Math.max(...ms) };
}

/**
 * `pairs` interleaved runs of two commands (spawn to exit, stdout discarded), after
 * one untimed run of each so the file cache is warm for both. Throws when a run
 * exits with a status not in `okStatus`.
 */
export function pairedSpawns(a: string[], b: string[], cwd: string, pairs: number, okStatus: readonly number[] = [0]): Paired {
  const run = (args: string[]): number => {
    const r = timeSpawn(process.execPath, args, cwd);
    if (r.status === null || !okStatus.includes(r.status)) throw new Error(`node ${args.join(' ')} exited ${r.status}: ${r.stderr.trim().split('\n').pop() ?? ''}`);
    return r.ms;
  };
  run(a);
  run(b);
  const ta: number[] = [];
  const tb: number[] = [];
  for (let i = 0; i < pairs; i++) {
    ta.push(run(a));
    tb.push(run(b));
  }
  const per = tb.map((x, i) => x / ta[i]);
  const sa = sample(ta);
  const sb = sample(tb);
  return { a: sa, b: sb, ratio: sb.median / sa.median, ratioRange: [Math.min(...per), Math.max(...per)], pairs };
}

/** `123 ms (110–150)`: median and range of a sample. */
export function showSample(s: Sample): string {
  return `${s.median.toFixed(0)} ms (${s.min.toFixed(0)}–${s.max.toFixed(0)})`;
}
