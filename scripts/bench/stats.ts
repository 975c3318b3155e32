/** Small statistics and timing helpers for the benchmarks (no timed tests: these only print). */

/** Median of a non-empty list; the machines are shared and noisy, so one run says little. */
export function median(xs: readonly number[]): number {
  if (xs.length === 0) return NaN;
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

/** Milliseconds since an hrtime start. */
export function msSince(start: bigint): number {
  return Number(process.hrtime.bigint() - start) / 1e6;
}

/** Run `fn` `runs` times, return each run's wall time in ms and the last result. */
export function timeRuns<T>(runs: number, fn: () => T): { ms: number[]; last: T } {
  const ms: number[] = [];
  let last!: T;
  for (let i = 0; i < runs; i++) {
    const t0 = process.hrtime.bigint();
    last = fn();
    ms.push(msSince(t0));
  }
  return { ms, last };
}

/** Deterministic uniform [0,1) generator (mulberry32), so every run queries the same points. */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
