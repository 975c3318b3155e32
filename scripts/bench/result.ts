/** One benchmark line: what was measured, against what, and whether it met its target. */
export type Status = 'PASS' | 'MISS' | 'INFO' | 'SKIP' | 'ERROR';

export interface BenchRow {
  section: string;
  measured: string;
  unit: string;
  baseline: number | null;
  baselineLabel: string;
  ours: number | null;
  /** ours / baseline, as the target states it. */
  ratio: number | null;
  target: string;
  status: Status;
  note?: string;
}

/** PASS when `ok`, MISS otherwise; a missing number is an error, not a miss. */
export function verdict(value: number | null, ok: (v: number) => boolean): Status {
  if (value === null || !Number.isFinite(value)) return 'ERROR';
  return ok(value) ? 'PASS' : 'MISS';
}
