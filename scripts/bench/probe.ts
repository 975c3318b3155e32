/** (c) `probe` whole process against bare node start-up, A/B interleaved. */
import { existsSync } from 'node:fs';
import { pairedSpawns, showSample } from './paired.js';
import { verdict, type BenchRow } from './result.js';
import { cliPath } from '../cli-path.js';

export const PROBE_ARGS = ['probe', '--kit', 'demo180', '--device', 'n', '--l', '0.5u', '--gmid', '12'];

export function benchProbe(opts: { root: string; pairs?: number; log?: (s: string) => void }): BenchRow[] {
  const pairs = opts.pairs ?? 11;
  const cli = cliPath(opts.root);
  const row: BenchRow = {
    section: 'c probe', measured: 'probe --kit demo180 --device n --l 0.5u --gmid 12, whole process', unit: 'ms',
    baseline: null, baselineLabel: 'node -e 0', ours: null, ratio: null, target: '<= 1.5x', status: 'ERROR',
  };
  if (!existsSync(cli)) {
    row.note = `${cli} not built (run npm run build first)`;
    return [row];
  }
  try {
    const p = pairedSpawns(['-e', '0'], [cli, ...PROBE_ARGS], opts.root, pairs);
    row.baseline = p.a.median;
    row.ours = p.b.median;
    row.ratio = p.ratio;
    row.status = verdict(p.ratio, (x) => x <= 1.5);
    row.note = `${pairs} A/B pairs interleaved, spawn to exit; medians (ranges): node -e 0 ${showSample(p.a)}, probe ${showSample(p.b)}; ` +
      `per-pair ratio ${p.ratioRange[0].toFixed(2)}–${p.ratioRange[1].toFixed(2)}`;
    opts.log?.(`probe: node -e 0 ${showSample(p.a)}, probe ${showSample(p.b)}`);
  } catch (e) {
    row.note = (e as Error).message.split('\n')[0];
  }
  return [row];
}
