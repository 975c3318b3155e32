import { spawn, type ChildProcess } from 'node:child_process';
import { rmSync } from 'node:fs';
import { mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { StackwrightError } from '../errors.js';

export interface NgspiceRun {
  stdout: string;
  stderr: string;
  /** Text of every file the run left in its working directory (the deck excluded), by file name. */
  files: Record<string, string>;
}

export interface RunOptions {
  /** Work in this directory (kept) instead of a fresh temp dir (removed afterwards). */
  cwd?: string;
  /** Kill ngspice after this long; default 120 s. */
  timeoutMs?: number;
  /** Executable, default `ngspice` on PATH. */
  binary?: string;
}

const DECK = 'deck.cir';

/** Run `ngspice -b` on a deck; throws a one-line StackwrightError when ngspice is missing or reports an error. */
export async function runNgspice(deck: string, opts: RunOptions = {}): Promise<NgspiceRun> {
  const run: Live = {};
  guard(run);
  try {
    const dir = opts.cwd ?? (run.dir = await mkdtemp(join(tmpdir(), 'stackwright-ngspice-')));
    await writeFile(join(dir, DECK), deck);
    const { stdout, stderr, code } = await spawnBatch(opts.binary ?? 'ngspice', dir, opts.timeoutMs ?? 120_000, run);
    const problem = firstError(stdout + '\n' + stderr);
    if (code !== 0 || problem) {
      throw new StackwrightError(`ngspice failed (exit ${code}): ${problem ?? lastLine(stderr || stdout)}`, {
        kind: 'internal',
        where: 'ngspice',
      });
    }
    const files: Record<string, string> = {};
    for (const name of await readdir(dir)) {
      if (name !== DECK) files[name] = await readFile(join(dir, name), 'utf8');
    }
    return { stdout, stderr, files };
  } finally {
    release(run);
    if (run.dir) await rm(run.dir, { recursive: true, force: true });
  }
}

/** A run in flight: its temporary folder (not a caller's `cwd`) and its ngspice process, once they exist. */
interface Live {
  dir?: string;
  child?: ChildProcess;
  /** The stop signal that ended it. */
  stop?: NodeJS.Signals;
}

// Runs in flight. While there are any, a stop signal first kills their ngspice processes (which would otherwise run on,
// orphaned, after a SIGTERM to this process alone) and removes their folders, then takes its usual effect. Only while
// they wait on ngspice: a handler installed for good would hold Ctrl-C back until synchronous work (a sizing) ends.
const live = new Set<Live>();
const STOPS = ['SIGINT', 'SIGTERM', 'SIGHUP'] as const;

function guard(run: Live): void {
  if (live.size === 0) for (const s of STOPS) process.on(s, stopped);
  live.add(run);
}

function release(run: Live): void {
  live.delete(run);
  if (live.size === 0) for (const s of STOPS) process.off(s, stopped);
}

function stopped(signal: NodeJS.Signals): void {
  for (const run of [...live]) {
    run.stop = signal;
    run.child?.kill('SIGKILL');
    if (run.dir) rmSync(run.dir, { recursive: true, force: true });
    release(run);
  }
  // The signal again, now with no handler of ours: the default ends the process as the signal says (a program using
  // this library with handlers of its own keeps them, and decides).
  if (process.listenerCount(signal) === 0) process.kill(process.pid, signal);
}

function spawnBatch(binary: string, cwd: string, timeoutMs: number, run: Live): Promise<{ stdout: string; stderr: string; code: number | null }> {
  return new Promise((resolve, reject) => {
    const child = spawn(binary, ['-b', DECK], { cwd, stdio: ['ignore', 'pipe', 'pipe'] });
    run.child = child;
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (d: Buffer) => (stdout += d.toString()));
    child.stderr.on('data', (d: Buffer) => (stderr += d.toString()));
    const timer = setTimeout(() => child.kill('SIGKILL'), timeoutMs);
    child.on('error', (err: NodeJS.ErrnoException) => {
      clearTimeout(timer);
      const msg =
        err.code === 'ENOENT'
          ? `"${binary}" not found on PATH; install ngspice (e.g. the Debian package "ngspice")`
          : `could not start ${binary}: ${err.message}`;
      reject(new StackwrightError(msg, { kind: 'internal', where: 'ngspice' }));
    });
    child.on('close', (code, signal) => {
      clearTimeout(timer);
      if (run.stop) {
        reject(new StackwrightError(`ngspice stopped: this process received ${run.stop}`, { kind: 'internal', where: 'ngspice' }));
      } else if (signal === 'SIGKILL') {
        reject(new StackwrightError(`ngspice did not finish within ${timeoutMs} ms`, { kind: 'internal', where: 'ngspice' }));
      } else resolve({ stdout, stderr, code });
    });
  });
}

// ngspice often exits 0 after a parse error in batch mode, so read its words too.
const ERROR_LINE = /^\s*(error\b.*|.*\berror:.*|.*unknown (?:model|subckt).*|.*could not find (?:include|lib).*|.*no such file.*|.*doAnalyses:.*|.*timestep too small.*|.*singular matrix.*|.*simulation\(s\) aborted.*)$/im;

/** First line of ngspice output that reports an error, if any. */
export function firstError(text: string): string | undefined {
  const m = ERROR_LINE.exec(text);
  if (!m) return undefined;
  // ngspice puts the offending line and the reason on the two lines after "Error on line N ...".
  const after = text.slice((m.index ?? 0) + m[0].length).split(/\r?\n/).map((l) => l.trim()).filter(Boolean).slice(0, 2);
  const head = m[0].trim();
  return /:\s*$/.test(head) && after.length ? `${head} ${after.join(' — ')}` : head;
}

function lastLine(text: string): string {
  const lines = text.trim().split(/\r?\n/);
  return lines[lines.length - 1] ?? '(no output)';
}
