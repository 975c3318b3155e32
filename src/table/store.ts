import { closeSync, existsSync, openSync, readdirSync, readFileSync, readSync, statSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { StackwrightError } from '../errors.js';
import { writeFileAtomic } from '../fsutil.js';
import { checkLayout, decodeHeader, decodeTable, encodeTableChunks } from './codec.js';
import type { TableHeader } from './codec.js';
import type { DeviceTable, Polarity } from './types.js';

export const TABLE_EXT = '.swtab';

/** `<dir>/<kit>/<device>-<corner>.swtab` */
export function tablePath(dir: string, kit: string, device: Polarity, corner: string): string {
  return join(dir, kit, `${device}-${corner}${TABLE_EXT}`);
}

/**
 * Stores a table atomically (temp file in the same folder, then rename), so a
 * failed write leaves any old file as it was. Refuses to replace a file unless
 * `force`. Returns the path written.
 */
export function writeTable(dir: string, table: DeviceTable, opts: { force?: boolean } = {}): string {
  const path = tablePath(dir, table.meta.kit, table.meta.device, table.meta.corner);
  if (!opts.force && existsSync(path)) {
    throw new StackwrightError(`${path} already exists; pass --force to overwrite it`, { kind: 'exists' });
  }
  const bytes = encodeTableChunks(table, `table ${table.meta.kit}/${table.meta.device}/${table.meta.corner}`);
  // Exclusive without force: a concurrent ingest of the same table that passed the check above loses cleanly.
  writeFileAtomic(path, bytes, { force: opts.force });
  cache.delete(resolve(path));
  return path;
}

/** Reads and fully validates one .swtab file; errors name the file. */
export function readTable(path: string): DeviceTable {
  let buf: Buffer;
  try {
    buf = readFileSync(path);
  } catch (e) {
    throw new StackwrightError(`cannot read table: ${(e as NodeJS.ErrnoException).code ?? (e as Error).message}`, { where: path });
  }
  return decodeTable(buf, path);
}

/** Opens a table file for reading; a file that cannot be opened is a one-line error naming it. */
export function openTableFile(path: string): number {
  try {
    return openSync(path, 'r');
  } catch (e) {
    throw new StackwrightError(`cannot read table: ${(e as NodeJS.ErrnoException).code ?? (e as Error).message}`, { where: path });
  }
}

/** Reads only the header lines (and checks the data size against it), for listings. */
export function readTableHeader(path: string): TableHeader {
  const fd = openTableFile(path);
  try {
    const total = statSync(path).size;
    const { header, dataStart } = readHeadFrom(fd, total, path);
    checkLayout(header, Math.max(0, total - dataStart), path);
    return header;
  } finally {
    closeSync(fd);
  }
}

/** Lines 1-2 of an open table file of `total` bytes, decoded. */
export function readHeadFrom(fd: number, total: number, path: string): ReturnType<typeof decodeHeader> {
  let buf = Buffer.alloc(Math.min(total, 1 << 16));
  let got = readSync(fd, buf, 0, buf.length, 0);
  // Headers with long axis lists can exceed the first chunk.
  while (buf.indexOf(10, buf.indexOf(10) + 1) < 0 && got < total) {
    const more = Buffer.alloc(Math.min(total, buf.length * 4));
    buf.copy(more, 0, 0, got);
    got += readSync(fd, more, got, more.length - got, got);
    buf = more;
  }
  return decodeHeader(buf.subarray(0, got), path);
}

/** Kits in a table folder: sub-folders holding at least one .swtab file, sorted. */
export function listKits(dir: string): string[] {
  return listDir(dir)
    .filter((name) => !name.startsWith('.'))
    .filter((name) => {
      try {
        return statSync(join(dir, name)).isDirectory() && tableFiles(join(dir, name)).length > 0;
      } catch {
        return false;
      }
    })
    .sort();
}

/** `<device>-<corner>` names of the tables of one kit, sorted. */
export function listTables(dir: string, kit: string): string[] {
  return tableFiles(join(dir, kit)).map((f) => f.slice(0, -TABLE_EXT.length)).sort();
}

function tableFiles(kitDir: string): string[] {
  return listDir(kitDir).filter((f) => f.endsWith(TABLE_EXT) && !f.startsWith('.') && /^[np]-/.test(f));
}

function listDir(dir: string): string[] {
  try {
    return readdirSync(dir);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    if (code === 'ENOENT') throw new StackwrightError(`table folder ${dir} does not exist`);
    throw new StackwrightError(`cannot list table folder ${dir}: ${code ?? (e as Error).message}`);
  }
}

interface CacheEntry {
  mtimeMs: number;
  size: number;
  table: DeviceTable;
}
const cache = new Map<string, CacheEntry>();

/** Forgets every cached table (tests, long-running tools). */
export function clearTableCache(): void {
  cache.clear();
}

/**
 * Loads one table by name, cached by resolved path (re-read when the file's
 * size or mtime changes). A missing kit, device or corner is an error listing
 * what does exist in `dir`.
 */
export function loadTable(dir: string, kit: string, device: Polarity, corner: string): DeviceTable {
  const path = tablePath(dir, kit, device, corner);
  const key = resolve(path);
  let st;
  try {
    st = statSync(path);
  } catch {
    throw missing(dir, kit, device, corner);
  }
  const hit = cache.get(key);
  if (hit && hit.mtimeMs === st.mtimeMs && hit.size === st.size) return hit.table;
  const table = readTable(path);
  const m = table.meta;
  if (m.kit !== kit || m.device !== device || m.corner !== corner) {
    throw new StackwrightError(
      `header says kit ${m.kit}, device ${m.device}, corner ${m.corner}, which does not match the file name`,
      { where: path },
    );
  }
  cache.set(key, { mtimeMs: st.mtimeMs, size: st.size, table });
  return table;
}

function missing(dir: string, kit: string, device: Polarity, corner: string): StackwrightError {
  const kits = listKits(dir);
  if (!kits.includes(kit)) {
    const have = kits.length ? `kits there: ${kits.join(', ')}` : 'it holds no kits';
    return new StackwrightError(`no kit "${kit}" in table folder ${dir}; ${have}`);
  }
  return new StackwrightError(
    `kit "${kit}" in ${dir} has no table for device ${device}, corner ${corner}; it has: ${listTables(dir, kit).join(', ')}`,
  );
}
