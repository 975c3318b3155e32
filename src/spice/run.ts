import { spawn } from 'node:child_process';
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
  const dir = opts.cwd ?? (await mkdtemp(join(tmpdir(), 'stackwright-ngspice-')));
  try {
    await writeFile(join(dir, DECK), deck);
    const { stdout, stderr, code } = await spawnBatch(opts.binary ?? 'ngspice', dir, opts.timeoutMs ?? 120_000);
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
    if (!opts.cwd) await rm(dir, { recursive: true, force: true });
  }
}

function spawnBatch(binary: string, cwd: string, timeoutMs: number): Promise<{ stdout: string; stderr: string; code: number | null }> {
  return new Promise((resolve, reject) => {
    const child = spawn(binary, ['-b', DECK], { cwd, stdio: ['ignore', 'pipe', 'pipe'] });
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
      if (signal === 'SIGKILL') {
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
