import { closeSync, existsSync, fsyncSync, mkdirSync, openSync, renameSync, rmSync, writeSync } from 'node:fs';
import { dirname, basename, join } from 'node:path';
import { randomBytes } from 'node:crypto';
import { StackwrightError } from './errors.js';

/**
 * Write a file atomically: a temp file beside it, fsync, rename. A failure
 * leaves any existing file untouched and no temp file behind.
 * Without `force` an existing file is an error (kind 'exists').
 */
export function writeFileAtomic(path: string, data: string | Uint8Array, opts: { force?: boolean } = {}): void {
  if (!opts.force && existsSync(path)) {
    throw new StackwrightError(`${path} exists; pass --force to overwrite it`, { kind: 'exists' });
  }
  const dir = dirname(path);
  mkdirSync(dir, { recursive: true });
  const tmp = join(dir, `.${basename(path)}.${process.pid}.${randomBytes(4).toString('hex')}.tmp`);
  try {
    const fd = openSync(tmp, 'w');
    try {
      const buf = typeof data === 'string' ? Buffer.from(data, 'utf8') : data;
      let off = 0;
      while (off < buf.length) off += writeSync(fd, buf, off, buf.length - off);
      fsyncSync(fd);
    } finally {
      closeSync(fd);
    }
    renameSync(tmp, path);
  } catch (e) {
    rmSync(tmp, { force: true });
    if (e instanceof StackwrightError) throw e;
    throw new StackwrightError(`cannot write ${path}: ${(e as Error).message}`, { kind: 'input' });
  }
}

/**
 * Write several files as one step: every target is checked before any is
 * written, so a refusal leaves none of them half-done.
 */
export function writeFilesAtomic(files: ReadonlyArray<readonly [string, string | Uint8Array]>, opts: { force?: boolean } = {}): void {
  if (!opts.force) {
    for (const [path] of files) {
      if (existsSync(path)) throw new StackwrightError(`${path} exists; pass --force to overwrite it`, { kind: 'exists' });
    }
  }
  for (const [path, data] of files) writeFileAtomic(path, data, { force: true });
}
