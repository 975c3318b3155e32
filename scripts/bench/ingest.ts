/** (a) Importer speed and peak memory on a 1M-row sweep, each job in a fresh node. */
import { mkdtempSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { nodeArgsFor, runNode } from './child.js';
import { verdict, type BenchRow } from './result.js';
import { median, msSince } from './stats.js';
import { writeBenchCsv } from './sweep-csv.js';

interface WorkerOut {
  ms: number;
  maxRssKb: number;
  rows: number;
}

export interface IngestBenchOptions {
  root: string;
  /** Runs of each job, interleaved (default 3). */
  runs?: number;
  log?: (s: string) => void;
}

export function benchIngest(opts: IngestBenchOptions): BenchRow[] {
  const runs = opts.runs ?? 3;
  const log = opts.log ?? (() => {});
  const dir = mkdtempSync(join(tmpdir(), 'stackwright-bench-'));
  try {
    const file = join(dir, 'sweep-1m.csv');
    const t0 = process.hrtime.bigint();
    const rows = writeBenchCsv(file);
    log(`ingest: wrote ${rows.toLocaleString('en-US')} rows (${(statSync(file).size / 1e6).toFixed(0)} MB) in ${(msSince(t0) / 1000).toFixed(1)} s`);
    const worker = nodeArgsFor(import.meta.url, 'ingest-worker');
    const job = (mode: string): WorkerOut => JSON.parse(runNode([...worker, mode, file], opts.root)) as WorkerOut;
    const base: WorkerOut[] = [];
    const ours: WorkerOut[] = [];
    for (let i = 0; i < runs; i++) {
      base.push(job('baseline'));
      ours.push(job('ingest'));
      log(`ingest: run ${i + 1}/${runs}: bare ${base[i].ms.toFixed(0)} ms, ingestFiles ${ours[i].ms.toFixed(0)} ms`);
    }
    const bMs = median(base.map((r) => r.ms));
    const oMs = median(ours.map((r) => r.ms));
    const ratio = oMs / bMs;
    const mb = (kb: number) => kb / 1024;
    const bPeak = Math.max(...base.map((r) => mb(r.maxRssKb)));
    const oPeak = Math.max(...ours.map((r) => mb(r.maxRssKb)));
    const cellsOk = ours.every((r) => r.rows === rows) && base.every((r) => r.rows === rows);
    const note = `median of ${runs} fresh processes each, interleaved; time excludes node start-up and module loading` +
      (cellsOk ? '' : `; ROW COUNT MISMATCH (wrote ${rows}, table/baseline ${ours[0].rows}/${base[0].rows})`);
    return [
      {
        section: 'a ingest', measured: `ingestFiles, ${rows.toLocaleString('en-US')}-row CSV`, unit: 'ms',
        baseline: bMs, baselineLabel: 'split+parseFloat', ours: oMs, ratio, target: '<= 3x',
        status: cellsOk ? verdict(ratio, (r) => r <= 3) : 'ERROR', note,
      },
      {
        section: 'a ingest', measured: 'peak memory (maxRSS)', unit: 'MB',
        baseline: bPeak, baselineLabel: 'split+parseFloat', ours: oPeak, ratio: oPeak / bPeak, target: '< 600 MB',
        status: verdict(oPeak, (m) => m < 600), note: `highest of ${runs} runs; includes node itself`,
      },
    ];
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
