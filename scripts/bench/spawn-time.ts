import { spawnSync } from 'node:child_process';
import { msSince } from './stats.js';

export interface Spawned {
  ms: number;
  status: number | null;
  stderr: string;
}

/** Wall time of one child process from spawn to exit, output discarded except stderr. */
export function timeSpawn(cmd: string, args: string[], cwd: string): Spawned {
  const t0 = process.hrtime.bigint();
  const r = spawnSync(cmd, args, { cwd, stdio: ['ignore', 'ignore', 'pipe'], encoding: 'utf8' });
  return { ms: msSince(t0), status: r.status, stderr: r.stderr ?? '' };
}
