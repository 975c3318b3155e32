/**
 * `npm run bench`: speed against baselines measured in the same run, medians and
 * ranges of repeated runs (the machines are shared and noisy); whole-process rows
 * run A/B interleaved. MISS is reported, not an
 * exit failure. Results also go to test-output/bench.json.
 */
import { mkdirSync, renameSync, writeFileSync } from 'node:fs';
import { cpus } from 'node:os';
import { join } from 'node:path';
import { packageRoot } from '../src/table/locate.js';
import { buildDemoTables } from './build-demo-tables.js';
import { benchIngest, benchInstructions, benchSliceLookups, benchKitLoad, benchProbe, benchSize, benchSpice, renderRows, type BenchRow } from './bench/index.js';
import { msSince } from './bench/stats.js';

const log = (s: string) => process.stderr.write(s + '\n');

/** A section that throws becomes one ERROR row, so the others still run. */
/** Sections named on the command line (by letter, e.g. `b c d`), or all. */
const only = process.argv.slice(2);

function section(name: string, run: () => BenchRow[]): BenchRow[] {
  if (only.length > 0 && !only.includes(name.split(' ')[0])) return [];
  try {
    return run();
  } catch (e) {
    return [{
      section: name, measured: 'section failed', unit: '', baseline: null, baselineLabel: '', ours: null, ratio: null,
      target: '', status: 'ERROR', note: (e as Error).message.split('\n')[0],
    }];
  }
}

function main(): void {
  const root = packageRoot();
  buildDemoTables(root, join(root, 'tables'), log);
  const t0 = process.hrtime.bigint();
  const rows = [
    ...section('a ingest', () => benchIngest({ root, log })),
    ...section('b lookups', () => benchSliceLookups({ root, log })),
    ...section('c probe', () => benchProbe({ root, log })),
    ...section('d size', () => benchSize({ root, log })),
    ...section('e kit load', () => benchKitLoad({ root, log })),
    ...section('f spice', () => benchSpice({ root, log })),
    ...section('g instructions', () => benchInstructions({ root, log })),
  ];
  const totalS = msSince(t0) / 1000;
  const machine = `node ${process.version}, ${cpus().length} × ${cpus()[0]?.model ?? 'cpu'}`;
  process.stdout.write(`\nstackwright benchmarks (${machine}; medians of repeated runs; total ${totalS.toFixed(0)} s)\n\n`);
  process.stdout.write(renderRows(rows) + '\n');
  const outDir = join(root, 'test-output');
  mkdirSync(outDir, { recursive: true });
  const file = join(outDir, 'bench.json');
  const tmp = `${file}.${process.pid}.tmp`;
  writeFileSync(tmp, JSON.stringify({ date: new Date().toISOString(), machine, totalSeconds: totalS, rows }, null, 2) + '\n');
  renameSync(tmp, file);
  process.stdout.write(`\nwritten ${join('test-output', 'bench.json')}\n`);
}

main();
