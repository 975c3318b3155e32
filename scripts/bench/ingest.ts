/**
 * (a) Importer speed and peak memory on a 1M-row, 13-column sweep, whole
 * process against whole process: `stackwright ingest FILE` (the built CLI, start
 * to exit, table written) against a bare script that reads the same file,
 * splits lines and cells and parseFloats every cell. Runs are interleaved A/B
 * pairs with the order alternating, and medians and ranges of the pairs are
 * reported (the machine is shared, so one run says little).
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { verdict, type BenchRow } from './result.js';
import { median, msSince } from './stats.js';
import { writeBenchCsv } from './sweep-csv.js';

export interface IngestBenchOptions {
  root: string;
  /** A/B pairs, interleaved (default 5, at least 5 for the medians the target asks for). */
  runs?: number;
  log?: (s: string) => void;
  /** Reuse this CSV instead of writing a fresh one (kept). */
  file?: string;
}

interface Run {
  ms: number;
  rssMb: number;
}

export interface IngestFigures {
  rows: number;
  bare: Run[];
  ingest: Run[];
}

const sibling = (name: string) => fileURLToPath(new URL(`./${name}.js`, import.meta.url));

/** Spawn node with the RSS probe preloaded; wall time from spawn to exit. */
function timed(args: string[], cwd: string, rssFile: string): Run {
  rmSync(rssFile, { force: true });
  const t0 = process.hrtime.bigint();
  const r = spawnSync(process.execPath, ['--import', sibling('rss-probe'), ...args], {
    cwd,
    env: { ...process.env, SW_BENCH_RSS: rssFile, NO_COLOR: '1' },
    encoding: 'utf8',
    maxBuffer: 16 * 1024 * 1024,
  });
  const ms = msSince(t0);
  if (r.status !== 0) throw new Error(`node ${args.join(' ')} exited ${r.status}: ${(r.stderr || r.stdout).trim().split('\n').pop()}`);
  if (!existsSync(rssFile)) throw new Error(`no peak memory reported by node ${args.join(' ')}`);
  return { ms, rssMb: Number(readFileSync(rssFile, 'utf8')) / 1024 };
}

/** Interleaved whole-process runs of the bare script (A) and `stackwright ingest` (B). */
export function measureIngest(opts: IngestBenchOptions): IngestFigures {
  const runs = Math.max(opts.runs ?? 5, 1);
  const log = opts.log ?? (() => {});
  const dir = mkdtempSync(join(tmpdir(), 'stackwright-bench-'));
  try {
    let file = opts.file;
    let rows: number;
    if (file === undefined) {
      file = join(dir, 'sweep-1m.csv');
      const t0 = process.hrtime.bigint();
      rows = writeBenchCsv(file);
      log(`ingest: wrote ${rows.toLocaleString('en-US')} rows (${(statSync(file).size / 1e6).toFixed(0)} MB) in ${(msSince(t0) / 1000).toFixed(1)} s`);
    } else {
      rows = readFileSync(file, 'latin1').split('\n').filter((l) => l !== '' && l[0] !== '#').length - 1;
    }
    const cli = fileURLToPath(new URL('../../src/cli/main.js', import.meta.url));
    if (!existsSync(cli)) throw new Error(`${cli} is missing: run the bench compiled (npm run bench)`);
    const rss = join(dir, 'rss');
    const bareArgs = [sibling('bare-main'), file];
    const ingestArgs = [cli, 'ingest', file, '--kit', 'bench', '--device', 'n', '--tables', join(dir, 'tables'), '--force'];
    const bare: Run[] = [];
    const ingest: Run[] = [];
    for (let i = 0; i < runs; i++) {
      // Alternate the order so drift on a shared machine does not favour one side.
      if (i % 2 === 0) {
        bare.push(timed(bareArgs, opts.root, rss));
        ingest.push(timed(ingestArgs, opts.root, rss));
      } else {
        ingest.push(timed(ingestArgs, opts.root, rss));
        bare.push(timed(bareArgs, opts.root, rss));
      }
      log(`ingest: pair ${i + 1}/${runs}: bare ${bare[i].ms.toFixed(0)} ms ${bare[i].rssMb.toFixed(0)} MB, stackwright ingest ${ingest[i].ms.toFixed(0)} ms ${ingest[i].rssMb.toFixed(0)} MB`);
    }
    return { rows, bare, ingest };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

const range = (xs: number[], digits = 0) => `${Math.min(...xs).toFixed(digits)}–${Math.max(...xs).toFixed(digits)}`;

export function benchIngest(opts: IngestBenchOptions): BenchRow[] {
  const f = measureIngest(opts);
  const n = f.bare.length;
  const bMs = median(f.bare.map((r) => r.ms));
  const oMs = median(f.ingest.map((r) => r.ms));
  const bMb = median(f.bare.map((r) => r.rssMb));
  const oMb = median(f.ingest.map((r) => r.rssMb));
  const timeRatios = f.ingest.map((r, i) => r.ms / f.bare[i].ms);
  const memRatios = f.ingest.map((r, i) => r.rssMb / f.bare[i].rssMb);
  const pairs = `${n} interleaved pairs, whole processes (spawn to exit)`;
  return [
    {
      section: 'a ingest', measured: `stackwright ingest, ${f.rows.toLocaleString('en-US')}-row 13-column CSV, table written`, unit: 'ms',
      baseline: bMs, baselineLabel: 'bare read+split+parseFloat script', ours: oMs, ratio: oMs / bMs, target: '<= 1.0x',
      status: verdict(oMs / bMs, (r) => r <= 1.0),
      note: `medians of ${pairs}; ranges bare ${range(f.bare.map((r) => r.ms))} ms, ingest ${range(f.ingest.map((r) => r.ms))} ms, per-pair ratio ${range(timeRatios, 2)}`,
    },
    {
      section: 'a ingest', measured: 'peak memory (maxRSS, node included)', unit: 'MB',
      baseline: bMb, baselineLabel: 'bare read+split+parseFloat script', ours: oMb, ratio: oMb / bMb, target: '<= 1.3x',
      status: verdict(oMb / bMb, (r) => r <= 1.3),
      note: `medians of ${pairs}; ranges bare ${range(f.bare.map((r) => r.rssMb))} MB, ingest ${range(f.ingest.map((r) => r.rssMb))} MB, per-pair ratio ${range(memRatios, 2)}`,
    },
  ];
}
