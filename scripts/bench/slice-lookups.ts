/**
 * (b) The lookups probe and size make: a length slice (src/device/slice.ts) between
 * two table lengths, `small` (jd, gm, gds, gmb) at random in-range voltages, against
 * NumPy/SciPy doing the same lookups by the same scheme (scipy_slice.py). Both sides
 * build the plane once, untimed, and time the queries; the results must agree.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { sliceAt } from '../../src/device/index.js';
import { AxisLocator, loadTable } from '../../src/table/index.js';
import type { DeviceTable } from '../../src/table/types.js';
import { verdict, type BenchRow } from './result.js';
import { sample, showSample } from './paired.js';
import { seededRandom, timeRuns } from './stats.js';

export interface SliceBenchOptions {
  root: string;
  points?: number;
  runs?: number;
  seed?: number;
  log?: (s: string) => void;
}

const QUANTITIES = ['id', 'gm', 'gds', 'gmb'] as const;
/** Between the demo kit's table lengths, so the plane is a log-log merge of two. */
const L = 0.5e-6;

/** `n` (vgs, vds, vsb) points uniform inside a table's voltage axes. */
export function randomVoltages(table: DeviceTable, n: number, seed: number): Float64Array {
  const rnd = seededRandom(seed);
  const v = new Float64Array(n * 3);
  const axes = [table.axes.vgs, table.axes.vds, table.axes.vsb];
  for (let i = 0; i < n; i++) {
    for (let d = 0; d < 3; d++) v[3 * i + d] = axes[d][0] + rnd() * (axes[d][axes[d].length - 1] - axes[d][0]);
  }
  return v;
}

/** Largest |a−b| / max(|a|,|b|, floor) over two result arrays; NaN counts as a failure. */
export function maxRelativeDifference(a: Float64Array, b: Float64Array, floor = 1e-300): number {
  if (a.length !== b.length) return Infinity;
  let worst = 0;
  for (let i = 0; i < a.length; i++) {
    const r = Math.abs(a[i] - b[i]) / Math.max(Math.abs(a[i]), Math.abs(b[i]), floor);
    if (!(r <= worst)) worst = r;
  }
  return worst;
}

function scipyAvailable(): boolean {
  return spawnSync('python3', ['-c', 'import scipy'], { stdio: 'ignore' }).status === 0;
}

/** The two table lengths around L, as the python side reads them: quantity × length × plane, little-endian. */
function writeExchange(dir: string, table: DeviceTable, points: Float64Array): void {
  const loc = new AxisLocator(table.axes.l);
  const il = loc.locate(L);
  const m = table.axes.vgs.length * table.axes.vds.length * table.axes.vsb.length;
  const blocks = QUANTITIES.map((q) => {
    const src = table.data[q];
    if (!src) throw new Error(`the demo table has no ${q} block`);
    return src.subarray(il * m, (il + 2) * m);
  });
  const meta = {
    L, l: [table.axes.l[il], table.axes.l[il + 1]], vgs: Array.from(table.axes.vgs), vds: Array.from(table.axes.vds),
    vsb: Array.from(table.axes.vsb), referenceWidth: table.meta.referenceWidth,
  };
  writeFileSync(join(dir, 'meta.json'), JSON.stringify(meta));
  writeFileSync(join(dir, 'data.bin'), Buffer.concat(blocks.map((b) => Buffer.from(b.buffer, b.byteOffset, b.byteLength))));
  writeFileSync(join(dir, 'points.bin'), Buffer.from(points.buffer, points.byteOffset, points.byteLength));
}

export function benchSliceLookups(opts: SliceBenchOptions): BenchRow[] {
  const n = opts.points ?? 200_000;
  const runs = opts.runs ?? 5;
  const log = opts.log ?? (() => {});
  const table = loadTable(join(opts.root, 'tables'), 'demo180', 'n', 'tt');
  const slice = sliceAt(table, L);
  const v = randomVoltages(table, n, opts.seed ?? 20240601);
  const out = new Float64Array(n * 4);
  const buf = new Float64Array(4);
  const run = (): void => {
    for (let i = 0; i < n; i++) {
      slice.small(v[3 * i], v[3 * i + 1], v[3 * i + 2], buf);
      out.set(buf, 4 * i);
    }
  };
  run(); // one warm-up so the JIT has compiled the loop
  const ours = sample(timeRuns(runs, run).ms);
  log(`lookups: slice.small ${showSample(ours)}`);
  const row: BenchRow = {
    section: 'b lookups', measured: `LengthSlice.small (probe/size path), L=0.5u, ${n.toLocaleString('en-US')} pts`, unit: 'queries/s',
    baseline: null, baselineLabel: 'NumPy/SciPy, same scheme', ours: n / (ours.median / 1000), ratio: null, target: '>= 1x SciPy', status: 'SKIP',
  };
  if (!scipyAvailable()) {
    row.note = 'SciPy not installed: skipped';
    return [row];
  }
  const dir = mkdtempSync(join(tmpdir(), 'stackwright-bench-'));
  try {
    writeExchange(dir, table, v);
    // tsc does not copy .py files to dist, so it is read from the source tree.
    const py = join(opts.root, 'scripts', 'bench', 'scipy_slice.py');
    const f = (name: string) => join(dir, name);
    const r = spawnSync('python3', [py, f('meta.json'), f('data.bin'), f('points.bin'), f('scipy.bin'), String(runs)], { encoding: 'utf8' });
    if (r.status !== 0) throw new Error(`scipy_slice.py failed: ${r.stderr.trim().split('\n').pop()}`);
    const info = JSON.parse(r.stdout) as { ms: number[]; scipy: string; numpy: string };
    const theirs = sample(info.ms);
    log(`lookups: NumPy/SciPy ${showSample(theirs)}`);
    const bytes = readFileSync(f('scipy.bin'));
    const ref = new Float64Array(new Uint8Array(bytes).buffer);
    // Relative to each quantity's own scale: gds and gmb cross zero in places.
    const diff = maxRelativeDifference(out, ref, 1e-12);
    const agree = diff <= 1e-9;
    row.baseline = n / (theirs.median / 1000);
    row.ratio = row.ours! / row.baseline;
    row.status = agree ? verdict(row.ratio, (x) => x >= 1) : 'ERROR';
    row.note = `median (range) of ${runs} runs each after one warm-up: ours ${showSample(ours)}, SciPy ${showSample(theirs)} ` +
      `(SciPy ${info.scipy}, NumPy ${info.numpy}); plane built once on each side, untimed; ` +
      `max relative difference ${diff.toExponential(2)} (${agree ? 'agrees' : 'DISAGREES'} to 1e-9)`;
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  return [row];
}
