import { closeSync, existsSync, fsyncSync, linkSync, mkdirSync, openSync, renameSync, rmSync, statSync, writeSync } from 'node:fs';
import { dirname, basename, join, resolve } from 'node:path';
import { StackwrightError } from './errors.js';

/** File content: text, bytes, or pieces of bytes written one after another (no joined copy). */
export type FileData = string | Uint8Array | readonly Uint8Array[];

/**
 * Write a file atomically: a temp file beside it, fsync, rename. A failure
 * leaves any existing file untouched and no temp file behind.
 * Without `force` an existing file is an error (kind 'exists').
 */
export function writeFileAtomic(path: string, data: FileData, opts: { force?: boolean } = {}): void {
  if (!opts.force) refuseExisting([path]);
  const tmp = stage(path, data);
  commit(tmp, path, !opts.force);
}

/**
 * Write several files as one step: every target is checked and every temp file
 * written before any target is replaced, so a refusal or a failing disk leaves
 * none of them half-done (only a failing rename, after the others, could).
 */
export function writeFilesAtomic(files: ReadonlyArray<readonly [string, FileData]>, opts: { force?: boolean } = {}): void {
  if (!opts.force) refuseExisting(files.map(([p]) => p));
  const staged: Array<[string, string]> = [];
  try {
    for (const [path, data] of files) staged.push([stage(path, data), path]);
  } catch (e) {
    for (const [tmp] of staged) removeQuietly(tmp);
    throw e;
  }
  for (let i = 0; i < staged.length; i++) {
    try {
      commit(staged[i][0], staged[i][1], !opts.force);
    } catch (e) {
      for (const [tmp] of staged.slice(i + 1)) removeQuietly(tmp);
      throw e;
    }
  }
}

function refuseExisting(paths: readonly string[]): void {
  for (const path of paths) {
    if (existsSync(path)) throw new StackwrightError(`${path} exists; pass --force to overwrite it`, { kind: 'exists' });
  }
}

/** Create a folder (and its parents) for output, or say why not: `--out /proc/x` fails at once. */
export function ensureFolder(dir: string): void {
  try {
    makeFolders(dir);
  } catch (e) {
    const why = (e as NodeJS.ErrnoException).code === 'EEXIST' ? 'a file of that name is in the way (EEXIST)' : reason(e);
    throw new StackwrightError(`cannot create folder ${dir}: ${why}`);
  }
}

/** Create the folder and write `data` to a synced temp file beside `path`; returns the temp path. */
function stage(path: string, data: FileData): string {
  const dir = dirname(path);
  ensureFolder(dir);
  const tmp = join(dir, `.${basename(path)}.${process.pid}.${tmpTag()}.tmp`);
  try {
    const fd = openSync(tmp, 'wx'); // exclusive: never write into someone else's file
    try {
      const pieces = typeof data === 'string' ? [Buffer.from(data, 'utf8')] : data instanceof Uint8Array ? [data] : data;
      for (const buf of pieces) {
        let off = 0;
        while (off < buf.length) off += writeSync(fd, buf, off, buf.length - off);
      }
      fsyncSync(fd);
    } finally {
      closeSync(fd);
    }
  } catch (e) {
    removeQuietly(tmp);
    throw new StackwrightError(`cannot write ${path}: ${reason(e)}`);
  }
  return tmp;
}

let tmpCount = 0;
/**
 * Distinct per call in this process (the pid separates processes). Not node:crypto:
 * loading it costs every command start-up ~10 ms, and a temp name needs no secrecy.
 */
function tmpTag(): string {
  tmpCount += 1;
  return `${tmpCount.toString(36)}${Math.floor(Math.random() * 0x100000000).toString(16)}`;
}

/**
 * Move the temp file into place. Without force the target is created
 * exclusively (a hard link fails with EEXIST if it exists), so of two
 * processes that both passed the existence check only one wins and the other
 * gets 'exists' instead of silently replacing the first one's file.
 */
function commit(tmp: string, path: string, exclusive: boolean): void {
  try {
    if (exclusive) {
      claim(tmp, path);
      removeQuietly(tmp);
    } else renameSync(tmp, path);
  } catch (e) {
    removeQuietly(tmp);
    if ((e as NodeJS.ErrnoException).code === 'EEXIST') {
      throw new StackwrightError(`${path} already exists (written meanwhile by another process); pass --force to overwrite it`, { kind: 'exists' });
    }
    throw new StackwrightError(`cannot write ${path}: ${reason(e)}`);
  }
}

/** Link tmp to path, or where hard links are unsupported reserve path with O_EXCL and rename over it. */
function claim(tmp: string, path: string): void {
  try {
    linkSync(tmp, path);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    if (code !== 'EPERM' && code !== 'ENOTSUP' && code !== 'EOPNOTSUPP' && code !== 'EXDEV' && code !== 'EMLINK') throw e;
    closeSync(openSync(path, 'wx'));
    renameSync(tmp, path);
  }
}

function removeQuietly(tmp: string): void {
  try {
    rmSync(tmp, { force: true });
  } catch {
    // the original error matters more than a leftover temp file
  }
}

/** "ENOTDIR: not a directory, mkdir '/x'" -> "not a directory (ENOTDIR)": the path is already in our message. */
function reason(e: unknown): string {
  const err = e as NodeJS.ErrnoException;
  const msg = String(err?.message ?? e).split(/\r?\n/)[0];
  const m = /^[A-Z0-9_]+: ([^,]+)/.exec(msg);
  if (m && err.code) return `${m[1]} (${err.code})`;
  return err?.code ? `${msg} (${err.code})` : msg;
}

/**
 * `mkdir -p` one level at a time from the nearest existing ancestor. Node's own
 * recursive mkdir loops without end where mkdir answers ENOENT for a parent that
 * exists (as under /proc), so a bad output path would hang instead of failing.
 * Throws the first mkdir error as it is (with its code).
 */
function makeFolders(dir: string): void {
  const missing: string[] = [];
  let at = resolve(dir);
  for (;;) {
    try {
      statSync(at);
      break; // exists; mkdir below reports a file in the way as EEXIST / ENOTDIR
    } catch (e) {
      if ((e as NodeJS.ErrnoException).code !== 'ENOENT') throw e;
    }
    missing.push(at);
    const up = dirname(at);
    if (up === at) break;
    at = up;
  }
  if (missing.length === 0) {
    if (!statSync(at).isDirectory()) mkdirSync(at); // throws EEXIST: a file is in the way
    return;
  }
  for (const d of missing.reverse()) {
    try {
      mkdirSync(d);
    } catch (e) {
      // Another process may have made the same folder since the stat above: that is not "in the way".
      if ((e as NodeJS.ErrnoException).code !== 'EEXIST' || !isFolder(d)) throw e;
    }
  }
}

function isFolder(path: string): boolean {
  try {
    return statSync(path).isDirectory();
  } catch {
    return false;
  }
}
