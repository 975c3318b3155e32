/** (c) `probe` start to finish against bare node start-up, interleaved so drift hits both alike. */
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { verdict, type BenchRow } from './result.js';
import { timeSpawn } from './spawn-time.js';
import { median } from './stats.js';

export const PROBE_ARGS = ['probe', '--kit', 'demo180', '--device', 'n', '--l', '0.5u', '--gmid', '12'];

export function benchProbe(opts: { root: string; runs?: number; log?: (s: string) => void }): BenchRow[] {
  const runs = opts.runs ?? 15;
  const cli = join(opts.root, 'dist', 'src', 'cli', 'main.js');
  const row: BenchRow = {
    section: 'c probe', measured: 'probe --kit demo180 --device n --l 0.5u --gmid 12', unit: 'ms',
    baseline: null, baselineLabel: 'node -e 0', ours: null, ratio: null, target: '<= 3x', status: 'ERROR',
  };
  if (!existsSync(cli)) {
    row.note = `${cli} not built (run tsc first)`;
    return [row];
  }
  const bare: number[] = [];
  const ours: number[] = [];
  for (let i = 0; i < runs; i++) {
    bare.push(timeSpawn(process.execPath, ['-e', '0'], opts.root).ms);
    const r = timeSpawn(process.execPath, [cli, ...PROBE_ARGS], opts.root);
    if (r.status !== 0) {
      row.note = `probe exited ${r.status}: ${r.stderr.trim().split('\n').pop() ?? ''}`;
      return [row];
    }
    ours.push(r.ms);
  }
  row.baseline = median(bare);
  row.ours = median(ours);
  row.ratio = row.ours / row.baseline;
  row.status = verdict(row.ratio, (x) => x <= 3);
  row.note = `median of ${runs} runs each, interleaved; spawn to exit`;
  opts.log?.(`probe: node -e 0 ${row.baseline.toFixed(0)} ms, probe ${row.ours.toFixed(0)} ms (medians)`);
  return [row];
}
