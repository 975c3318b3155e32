/** (d) Sizing the demo spec: whole process cold against `node -e 0`, and in process cold and warm. */
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { availableParallelism, tmpdir } from 'node:os';
import { join } from 'node:path';
import { parseSpec } from '../../src/design/index.js';
import { sizeDesign } from '../../src/solve/index.js';
import { loadKit } from '../../src/api.js';
import { pairedSpawns, sample, showSample } from './paired.js';
import { verdict, type BenchRow } from './result.js';
import { msSince } from './stats.js';
import { cliPath } from '../cli-path.js';

export const DEMO_SPEC = join('demo-tables', 'specs', 'marsh-wren.yaml');

export function benchSize(opts: { root: string; pairs?: number; warmRuns?: number; log?: (s: string) => void }): BenchRow[] {
  return [wholeProcessRow(opts), jobsRow(opts), stageRow(opts), ...inProcessRows(opts)];
}

/** What a user waits for: `stackwright size SPEC`, spawn to exit, beside bare node start-up. */
function wholeProcessRow(opts: { root: string; pairs?: number; log?: (s: string) => void }): BenchRow {
  const pairs = opts.pairs ?? 5;
  const cli = cliPath(opts.root);
  const row: BenchRow = {
    section: 'd size', measured: `size ${DEMO_SPEC}, whole process (cold)`, unit: 'ms', baseline: null, baselineLabel: 'node -e 0',
    ours: null, ratio: null, target: '<= 4x', status: 'ERROR',
  };
  if (!existsSync(cli)) {
    row.note = 'CLI not built: skipped';
    row.status = 'SKIP';
    return row;
  }
  try {
    // Exit 3 (a stack infeasible) is a finished run too.
    const p = pairedSpawns(['-e', '0'], [cli, 'size', DEMO_SPEC], opts.root, pairs, [0, 3]);
    row.baseline = p.a.median;
    row.ours = p.b.median;
    row.ratio = p.ratio;
    row.status = verdict(p.ratio, (x) => x <= 4);
    row.note = `${pairs} A/B pairs interleaved, spawn to exit (module loading, table reading and the search, JIT cold); ` +
      `medians (ranges): node -e 0 ${showSample(p.a)}, size ${showSample(p.b)}; per-pair ratio ${p.ratioRange[0].toFixed(2)}–${p.ratioRange[1].toFixed(2)}`;
    opts.log?.(`size: node -e 0 ${showSample(p.a)}, size ${showSample(p.b)}`);
  } catch (e) {
    row.note = (e as Error).message.split('\n')[0];
  }
  return row;
}

/** sizeDesign in this process: the first run (JIT cold, tables read) and then warm runs (tables cached). */
function inProcessRows(opts: { root: string; warmRuns?: number; log?: (s: string) => void }): BenchRow[] {
  const runs = opts.warmRuns ?? 5;
  const specPath = join(opts.root, DEMO_SPEC);
  const once = (): { ms: number; evaluated: number } => {
    const t0 = process.hrtime.bigint();
    const spec = parseSpec(readFileSync(specPath, 'utf8'), DEMO_SPEC);
    const result = sizeDesign(spec, loadKit(spec.kit, { tables: join(opts.root, 'tables') }));
    return { ms: msSince(t0), evaluated: result.stacks.reduce((s, st) => s + st.evaluated, 0) };
  };
  const first = once();
  const warm = sample(Array.from({ length: runs }, () => once().ms));
  opts.log?.(`size in process: first ${first.ms.toFixed(0)} ms, warm ${showSample(warm)}`);
  return [
    {
      section: 'd size', measured: 'sizeDesign in process, first run (JIT cold)', unit: 'ms', baseline: null, baselineLabel: '',
      ours: first.ms, ratio: null, target: 'information', status: 'INFO',
      note: 'parse the spec, read the tables it needs, search; module loading excluded (see the whole-process row)',
    },
    {
      section: 'd size', measured: 'sizeDesign in process, warm', unit: 'ms', baseline: null, baselineLabel: '',
      ours: warm.median, ratio: null, target: 'information', status: 'INFO',
      note: `median (range) of ${runs} runs after the first: ${showSample(warm)}; tables cached; ${first.evaluated} candidates evaluated per run`,
    },
  ];
}

/** The demo spec with its stage against the same spec without stages: whole process, interleaved pairs. */
function stageRow(opts: { root: string; pairs?: number; log?: (s: string) => void }): BenchRow {
  const pairs = opts.pairs ?? 5;
  const cli = cliPath(opts.root);
  const row: BenchRow = {
    section: 'd size', measured: `size ${DEMO_SPEC} with its stage, against the same spec without stages`, unit: 'ms',
    baseline: null, baselineLabel: 'without stages', ours: null, ratio: null, target: '<= 1.5x', status: 'SKIP',
  };
  const text = readFileSync(join(opts.root, DEMO_SPEC), 'utf8');
  const cut = text.search(/^stages:/m);
  if (!existsSync(cli) || cut < 0) {
    row.note = existsSync(cli) ? 'demo spec has no stages: skipped' : 'CLI not built: skipped';
    return row;
  }
  const dir = mkdtempSync(join(tmpdir(), 'stackwright-bench-'));
  const without = join(dir, 'no-stages.yaml');
  writeFileSync(without, text.slice(0, cut));
  try {
    const p = pairedSpawns([cli, 'size', without], [cli, 'size', DEMO_SPEC], opts.root, pairs, [0, 3]);
    row.baseline = p.a.median;
    row.ours = p.b.median;
    row.ratio = p.ratio;
    row.status = verdict(p.ratio, (x) => x <= 1.5);
    row.note = `${pairs} A/B pairs interleaved, spawn to exit; medians (ranges): without ${showSample(p.a)}, with ${showSample(p.b)}; ` +
      `per-pair ratio ${p.ratioRange[0].toFixed(2)}–${p.ratioRange[1].toFixed(2)}`;
    opts.log?.(`size with stage: without ${showSample(p.a)}, with ${showSample(p.b)}`);
  } catch (e) {
    row.note = (e as Error).message.split('\n')[0];
    row.status = 'ERROR';
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  return row;
}

/** `size --brief --jobs <cores>` against the default one thread: whole process, interleaved pairs. */
function jobsRow(opts: { root: string; pairs?: number; log?: (s: string) => void }): BenchRow {
  const pairs = opts.pairs ?? 5;
  const cli = cliPath(opts.root);
  const cores = availableParallelism();
  const row: BenchRow = {
    section: 'd size', measured: `size ${DEMO_SPEC} --brief --jobs ${cores}, against one thread (the default)`, unit: 'ms',
    baseline: null, baselineLabel: 'one thread', ours: null, ratio: null, target: '< 1x with a free core', status: 'SKIP',
  };
  if (!existsSync(cli) || cores < 2) {
    row.note = existsSync(cli) ? 'one core: nothing to compare, skipped' : 'CLI not built: skipped';
    return row;
  }
  try {
    const p = pairedSpawns([cli, 'size', DEMO_SPEC, '--brief'], [cli, 'size', DEMO_SPEC, '--brief', '--jobs', String(cores)], opts.root, pairs, [0, 3]);
    row.baseline = p.a.median;
    row.ours = p.b.median;
    row.ratio = p.ratio;
    row.status = verdict(p.ratio, (x) => x < 1);
    row.note = `${pairs} A/B pairs interleaved, spawn to exit; medians (ranges): one thread ${showSample(p.a)}, --jobs ${cores} ${showSample(p.b)}; ` +
      `per-pair ratio ${p.ratioRange[0].toFixed(2)}–${p.ratioRange[1].toFixed(2)}; a worker thread pays its own start-up, table reading and JIT warm-up, so it gains only with a core to spare`;
    opts.log?.(`size threads: one ${showSample(p.a)}, --jobs ${cores} ${showSample(p.b)}`);
  } catch (e) {
    row.note = (e as Error).message.split('\n')[0];
    row.status = 'ERROR';
  }
  return row;
}
