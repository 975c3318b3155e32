/**
 * (g) Instructions of whole processes, counted by valgrind's callgrind tool: a figure that repeats on a shared,
 * noisy machine where wall-clock times do not (repeat runs agree within about 0.2 %), for judging a change to the
 * search. node runs with `--single-threaded`, so V8's optimising compiler and garbage collector work on the main
 * thread and are counted too (in a normal run they use the second core). Informational: the targets are on the
 * wall-clock rows. Skipped when valgrind is not installed (Debian package `valgrind`).
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { cliPath } from '../cli-path.js';
import type { BenchRow } from './result.js';
import { DEMO_SPEC } from './size.js';
import { PROBE_ARGS } from './probe.js';

/** Instructions callgrind counts for `node --single-threaded ARGS` (output discarded), or an error line. */
export function countInstructions(args: readonly string[], cwd: string): number | string {
  const dir = mkdtempSync(join(tmpdir(), 'sw-cg-'));
  try {
    const r = spawnSync('valgrind', ['--tool=callgrind', `--callgrind-out-file=${join(dir, 'out')}`, '--smc-check=all-non-file', process.execPath, '--single-threaded', ...args], {
      cwd, stdio: ['ignore', 'ignore', 'pipe'], encoding: 'utf8',
    });
    const m = /Collected\s*:\s*(\d+)/.exec(r.stderr ?? '');
    return m ? Number(m[1]) : `no count from valgrind (exit ${r.status}): ${(r.stderr ?? '').trim().split('\n').pop() ?? ''}`;
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

function hasValgrind(): boolean {
  const r = spawnSync('valgrind', ['--version'], { stdio: 'ignore' });
  return r.status === 0;
}

export function benchInstructions(opts: { root: string; log?: (s: string) => void }): BenchRow[] {
  const cli = cliPath(opts.root);
  const rows: Array<{ measured: string; args: string[] }> = [
    { measured: `size ${DEMO_SPEC}, whole process, instructions`, args: [cli, 'size', DEMO_SPEC] },
    { measured: `${PROBE_ARGS.join(' ')}, whole process, instructions`, args: [cli, ...PROBE_ARGS] },
  ];
  const base = (r: { measured: string }): BenchRow => ({
    section: 'g instructions', measured: r.measured, unit: 'G instr', baseline: null, baselineLabel: 'node -e 0',
    ours: null, ratio: null, target: 'information', status: 'SKIP',
  });
  if (!hasValgrind() || !existsSync(cli)) {
    return rows.map((r) => ({ ...base(r), note: !existsSync(cli) ? `${cli} not built` : 'valgrind not installed (Debian: apt-get install valgrind)' }));
  }
  const bare = countInstructions(['-e', '0'], opts.root);
  return rows.map((r) => {
    const row = base(r);
    const ours = countInstructions(r.args, opts.root);
    if (typeof bare === 'string' || typeof ours === 'string') {
      row.status = 'ERROR';
      row.note = typeof bare === 'string' ? bare : (ours as string);
      return row;
    }
    row.baseline = bare / 1e9;
    row.ours = ours / 1e9;
    row.ratio = ours / bare;
    row.status = 'INFO';
    row.note = 'valgrind --tool=callgrind, node --single-threaded (compiler and GC counted on the main thread; the code cache does not apply under this flag, so parsing is counted too); one run each, repeatable within about 0.2 %';
    opts.log?.(`instructions: node -e 0 ${(bare / 1e9).toFixed(3)} G, ${r.measured.split(',')[0]} ${(ours / 1e9).toFixed(3)} G`);
    return row;
  });
}
