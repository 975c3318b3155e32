/** (b) Batched 4-D table queries against SciPy, plus length-slice queries for information. */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { sliceAt } from '../../src/device/index.js';
import { RegularGridInterpolator, loadTable } from '../../src/table/index.js';
import { AXES, type DeviceTable } from '../../src/table/types.js';
import { readFloat64, writeGridFile } from './grid-file.js';
import { verdict, type BenchRow } from './result.js';
import { median, seededRandom, timeRuns } from './stats.js';

export interface InterpBenchOptions {
  root: string;
  points?: number;
  runs?: number;
  seed?: number;
  log?: (s: string) => void;
}

/** `n` points uniform inside the table's axes, row-major (n × 4). */
export function randomPoints(table: DeviceTable, n: number, seed: number): Float64Array {
  const rnd = seededRandom(seed);
  const pts = new Float64Array(n * AXES.length);
  const spans = AXES.map((a) => [table.axes[a][0], table.axes[a][table.axes[a].length - 1]] as const);
  for (let i = 0; i < n; i++) {
    for (let d = 0; d < AXES.length; d++) pts[i * AXES.length + d] = spans[d][0] + rnd() * (spans[d][1] - spans[d][0]);
  }
  return pts;
}

/** Largest |a−b| / max(|a|,|b|) over two result arrays (values are currents: ≥ 0, no cancellation). */
export function maxRelativeDifference(a: Float64Array, b: Float64Array): number {
  if (a.length !== b.length) return Infinity;
  let worst = 0;
  for (let i = 0; i < a.length; i++) {
    const scale = Math.max(Math.abs(a[i]), Math.abs(b[i]), 1e-300);
    const r = Math.abs(a[i] - b[i]) / scale;
    if (!(r <= worst)) worst = r; // NaN propagates as a failure
  }
  return worst;
}

function scipyAvailable(): boolean {
  return spawnSync('python3', ['-c', 'import scipy'], { stdio: 'ignore' }).status === 0;
}

export function benchInterp(opts: InterpBenchOptions): BenchRow[] {
  const n = opts.points ?? 1_000_000;
  const runs = opts.runs ?? 5;
  const log = opts.log ?? (() => {});
  const table = loadTable(join(opts.root, 'tables'), 'demo180', 'n', 'tt');
  const axes = AXES.map((a) => table.axes[a]);
  const interp = new RegularGridInterpolator(axes, table.data.id, { names: AXES });
  const points = randomPoints(table, n, opts.seed ?? 20240601);
  const out = new Float64Array(n);
  interp.interpolateBatch(points, out); // one warm-up so the JIT has compiled the loop
  const ours = timeRuns(runs, () => interp.interpolateBatch(points, out));
  const oursMs = median(ours.ms);
  const oursQps = n / (oursMs / 1000);
  log(`interp: interpolateBatch ${ours.ms.map((m) => m.toFixed(0)).join(', ')} ms`);
  const rows: BenchRow[] = [];
  const main: BenchRow = {
    section: 'b queries', measured: `interpolateBatch, ${n.toLocaleString('en-US')} pts, 4-D id`, unit: 'queries/s',
    baseline: null, baselineLabel: 'SciPy RGI linear', ours: oursQps, ratio: null, target: '>= 1x SciPy', status: 'SKIP',
  };
  if (!scipyAvailable()) {
    main.note = 'SciPy not installed: skipped';
  } else {
    const dir = mkdtempSync(join(tmpdir(), 'stackwright-bench-'));
    try {
      const gridFile = join(dir, 'grid.bin');
      const resFile = join(dir, 'scipy.bin');
      writeGridFile(gridFile, axes, table.data.id, points);
      // tsc does not copy .py files to dist, so it is read from the source tree.
      const py = join(opts.root, 'scripts', 'bench', 'scipy_interp.py');
      const r = spawnSync('python3', [py, gridFile, resFile, String(runs)], { encoding: 'utf8' });
      if (r.status !== 0) throw new Error(`scipy_interp.py failed: ${r.stderr.trim().split('\n').pop()}`);
      const info = JSON.parse(r.stdout) as { ms: number[]; scipy: string; numpy: string };
      log(`interp: SciPy ${info.ms.map((m) => m.toFixed(0)).join(', ')} ms`);
      const sciQps = n / (median(info.ms) / 1000);
      const diff = maxRelativeDifference(out, readFloat64(resFile));
      const agree = diff <= 1e-9;
      main.baseline = sciQps;
      main.ratio = oursQps / sciQps;
      main.status = agree ? verdict(main.ratio, (x) => x >= 1) : 'ERROR';
      main.note = `median of ${runs} batched calls each (after one warm-up each); SciPy ${info.scipy}, NumPy ${info.numpy}; ` +
        `max relative difference ${diff.toExponential(2)} (${agree ? 'agrees' : 'DISAGREES'} to 1e-9)`;
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }
  rows.push(main);
  rows.push(benchSlice(table, Math.min(n, 200_000), runs, opts.seed ?? 20240601, log));
  return rows;
}

/** LengthSlice.small at L = 0.5 µm (between table lengths), random in-range voltages. */
function benchSlice(table: DeviceTable, n: number, runs: number, seed: number, log: (s: string) => void): BenchRow {
  const l = 0.5e-6;
  const slice = sliceAt(table, l);
  const rnd = seededRandom(seed + 1);
  const v = new Float64Array(n * 3);
  const { vgs, vds, vsb } = slice.range;
  for (let i = 0; i < n; i++) {
    v[3 * i] = vgs[0] + rnd() * (vgs[1] - vgs[0]);
    v[3 * i + 1] = vds[0] + rnd() * (vds[1] - vds[0]);
    v[3 * i + 2] = vsb[0] + rnd() * (vsb[1] - vsb[0]);
  }
  const buf = new Float64Array(4);
  const run = () => {
    let s = 0;
    for (let i = 0; i < n; i++) s += slice.small(v[3 * i], v[3 * i + 1], v[3 * i + 2], buf)[1];
    return s;
  };
  run();
  const t = timeRuns(runs, run);
  log(`interp: slice.small ${t.ms.map((m) => m.toFixed(0)).join(', ')} ms`);
  return {
    section: 'b queries', measured: `LengthSlice.small, L=0.5u, ${n.toLocaleString('en-US')} pts`, unit: 'queries/s',
    baseline: null, baselineLabel: '', ours: n / (median(t.ms) / 1000), ratio: null, target: 'information', status: 'INFO',
    note: `median of ${runs} runs; jd, gm, gds, gmb per call`,
  };
}
