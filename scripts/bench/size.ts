/** (d) Sizing the demo spec end to end, in process and through the CLI. */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { parseSpec } from '../../src/design/index.js';
import { sizeDesign } from '../../src/solve/index.js';
import { loadKit } from '../../src/api.js';
import { clearTableCache } from '../../src/table/index.js';
import { verdict, type BenchRow } from './result.js';
import { timeSpawn } from './spawn-time.js';
import { median, msSince } from './stats.js';

export const DEMO_SPEC = join('demo-tables', 'specs', 'marsh-wren.yaml');

export function benchSize(opts: { root: string; runs?: number; log?: (s: string) => void }): BenchRow[] {
  const runs = opts.runs ?? 5;
  const specPath = join(opts.root, DEMO_SPEC);
  const times: number[] = [];
  let evaluated = 0;
  let corners: string[] = [];
  for (let i = 0; i < runs; i++) {
    // End to end: parsing and table reading are part of the job, so the cache is emptied each run.
    clearTableCache();
    const t0 = process.hrtime.bigint();
    const spec = parseSpec(readFileSync(specPath, 'utf8'), DEMO_SPEC);
    const kit = loadKit(spec.kit, { tables: join(opts.root, 'tables') });
    const result = sizeDesign(spec, kit); // resolves the spec's corners against the kit
    corners = result.corners;
    times.push(msSince(t0));
    evaluated = result.stacks.reduce((s, st) => s + st.evaluated, 0);
  }
  opts.log?.(`size: ${times.map((m) => m.toFixed(0)).join(', ')} ms, ${evaluated} candidates`);
  const ms = median(times);
  const rows: BenchRow[] = [
    {
      section: 'd size', measured: `sizeDesign ${DEMO_SPEC} (${corners.join(',')})`, unit: 'ms',
      baseline: 1000, baselineLabel: 'target 1 s', ours: ms, ratio: ms / 1000, target: '< 1x of 1 s', status: verdict(ms, (x) => x < 1000),
      note: `median of ${runs} runs, each parsing the spec and reading the kit's tables afresh (first run, JIT cold: ${times[0].toFixed(0)} ms)`,
    },
    {
      section: 'd size', measured: 'candidates evaluated', unit: 'per s', baseline: null, baselineLabel: '',
      ours: evaluated / (ms / 1000), ratio: null, target: 'information', status: 'INFO',
      note: `${evaluated} candidates (sum of evaluated over ${DEMO_SPEC} result stacks) / median time`,
    },
  ];
  rows.push(cliRow(opts.root));
  return rows;
}

/** One run of the CLI for information; the command may be missing in a partial tree. */
function cliRow(root: string): BenchRow {
  const cli = join(root, 'dist', 'src', 'cli', 'main.js');
  const row: BenchRow = {
    section: 'd size', measured: `CLI size ${DEMO_SPEC} --json`, unit: 'ms', baseline: null, baselineLabel: '',
    ours: null, ratio: null, target: 'information', status: 'INFO',
  };
  if (!existsSync(cli)) {
    row.note = 'CLI not built: skipped';
    row.status = 'SKIP';
    return row;
  }
  const r = timeSpawn(process.execPath, [cli, 'size', DEMO_SPEC, '--json'], root);
  if (r.status !== 0) {
    row.status = 'SKIP';
    row.note = `size command not available or failed (exit ${r.status}): ${r.stderr.trim().split('\n').pop() ?? ''}`;
    return row;
  }
  row.ours = r.ms;
  row.note = 'one run, spawn to exit, stdout discarded';
  return row;
}
