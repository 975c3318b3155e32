import { spawn } from 'node:child_process';
import { chmodSync, existsSync, mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ensureDemoTables, REPO, TSX } from './helpers/cli.js';
import { scratchDir } from './helpers/scratch.js';

/**
 * Stopping `size --spice` while ngspice runs (Ctrl-C, or SIGTERM from a job runner): the process still ends by that
 * signal, and leaves no ngspice process running and no temporary folder behind (before, a SIGTERM left ngspice running
 * orphaned and its folder in the temp folder). The "ngspice" on PATH here is a stand-in script that writes its pid into
 * its working folder and sleeps.
 */

/** Whether a process is running (a zombie, which is only waiting to be reaped, is not; read from /proc on Linux). */
function running(pid: number): boolean {
  try {
    return readFileSync(`/proc/${pid}/stat`, 'utf8').replace(/^.*\) /s, '')[0] !== 'Z';
  } catch {
    return false;
  }
}

async function until<T>(f: () => T | undefined, ms: number): Promise<T> {
  const end = Date.now() + ms;
  for (;;) {
    const v = f();
    if (v !== undefined) return v;
    if (Date.now() > end) throw new Error(`gave up after ${ms} ms`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

const SPEC = ['kit: reed180', 'corner: tt', 'supply: 1.8', 'stacks:', '  - name: tail', '    device: n', '    topology: cascode',
  '    current: 40u', '    rout: 20meg', '    headroom: 0.5', '    span: 1.6', ''].join('\n');

describe.runIf(process.platform === 'linux').each(['SIGTERM', 'SIGINT'] as const)('size --spice stopped by %s while ngspice runs', (signal) => {
  it('ends by the signal, with ngspice killed and its folder removed', async () => {
    ensureDemoTables();
    const dir = scratchDir('sw-stop-');
    const bin = join(dir, 'bin');
    const tmp = join(dir, 'tmp');
    mkdirSync(bin);
    mkdirSync(tmp);
    writeFileSync(join(bin, 'ngspice'), '#!/bin/sh\necho $$ > ngspice.pid\nexec sleep 60\n');
    chmodSync(join(bin, 'ngspice'), 0o755);
    writeFileSync(join(dir, 'spec.yaml'), SPEC);
    const cli = spawn(process.execPath, [
      '--import', TSX, join(REPO, 'src', 'cli', 'main.ts'), 'size', join(dir, 'spec.yaml'),
      '--spice', '--include', join(REPO, 'demo-tables', 'reed180', 'reed180.lib'), '--model-n', 'nfet_reed', '--model-p', 'pfet_reed',
    ], { cwd: REPO, env: { ...process.env, PATH: `${bin}:${process.env.PATH}`, TMPDIR: tmp, NO_COLOR: '1' }, stdio: 'ignore' });
    const ended = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((r) => cli.on('exit', (code, sig) => r({ code, signal: sig })));
    const folders = () => readdirSync(tmp).filter((n) => n.startsWith('stackwright-ngspice-'));
    const pidFile = await until(() => folders().map((f) => join(tmp, f, 'ngspice.pid')).find((p) => existsSync(p) && readFileSync(p, 'utf8').trim() !== ''), 90_000);
    const pid = Number(readFileSync(pidFile, 'utf8'));
    expect(running(pid)).toBe(true);

    cli.kill(signal);
    expect(await ended).toEqual({ code: null, signal });
    expect(folders()).toEqual([]);
    await until(() => (running(pid) ? undefined : true), 5_000);
  }, 120_000);
});
