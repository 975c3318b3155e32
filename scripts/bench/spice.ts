/**
 * (f) `size --spice` on the reed180 demo spec (every design confirmed in ngspice at tt and ss)
 * against `size` alone on the same spec, whole process, interleaved A/B pairs so drift of
 * the shared machine hits both alike; medians and ranges.
 */
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { verdict, type BenchRow } from './result.js';
import { timeSpawn } from './spawn-time.js';
import { median } from './stats.js';

export const SPICE_SPEC = join('demo-tables', 'specs', 'marsh-wren-spice.yaml');
const SPICE_ARGS = ['--spice', '--include', join('demo-tables', 'reed180', 'reed180.lib'), '--model-n', 'nfet_reed', '--model-p', 'pfet_reed'];
/** The aim: confirming the demo spec takes seconds, not minutes. */
const TARGET_MS = 10_000;

const range = (xs: number[]) => `${Math.min(...xs).toFixed(0)}–${Math.max(...xs).toFixed(0)} ms`;

export function benchSpice(opts: { root: string; pairs?: number; log?: (s: string) => void }): BenchRow[] {
  const pairs = Math.max(5, opts.pairs ?? 5);
  const cli = join(opts.root, 'dist', 'src', 'cli', 'main.js');
  const row: BenchRow = {
    section: 'f spice', measured: `CLI size ${SPICE_SPEC} --spice (tt, ss)`, unit: 'ms', baseline: null, baselineLabel: 'size alone',
    ours: null, ratio: null, target: `< ${TARGET_MS / 1000} s`, status: 'SKIP',
  };
  if (!existsSync(cli)) return [{ ...row, note: `${cli} not built (run tsc first)` }];
  if (spawnSync('ngspice', ['-v'], { encoding: 'utf8' }).error) return [{ ...row, note: 'ngspice not installed (apt-get install ngspice): skipped' }];
  const alone: number[] = [];
  const spice: number[] = [];
  for (let i = 0; i < pairs; i++) {
    const a = timeSpawn(process.execPath, [cli, 'size', SPICE_SPEC, '--json'], opts.root);
    const b = timeSpawn(process.execPath, [cli, 'size', SPICE_SPEC, '--json', ...SPICE_ARGS], opts.root);
    for (const r of [a, b]) {
      if (r.status !== 0) return [{ ...row, status: 'ERROR', note: `exit ${r.status}: ${r.stderr.trim().split('\n').pop() ?? ''}` }];
    }
    alone.push(a.ms);
    spice.push(b.ms);
  }
  row.baseline = median(alone);
  row.ours = median(spice);
  row.ratio = row.ours / row.baseline;
  row.status = verdict(row.ours, (x) => x < TARGET_MS);
  row.note = `medians of ${pairs} interleaved pairs, spawn to exit; size alone ${range(alone)}, with --spice ${range(spice)}`;
  opts.log?.(`spice: size ${alone.map((m) => m.toFixed(0)).join(', ')} ms; size --spice ${spice.map((m) => m.toFixed(0)).join(', ')} ms`);
  return [row];
}
