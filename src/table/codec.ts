import { endianness } from 'node:os';
import { StackwrightError } from '../errors.js';
import { checkAxes, checkMeta, validateTable } from './validate.js';
import { AXES, STORED, tableSize } from './types.js';
import type { Axis, DeviceTable, StoredQuantity, TableMeta } from './types.js';

/**
 * The .swtab layout, our own:
 *   line 1  `stackwright-table 1`
 *   line 2  one JSON object {meta, axes, layout}; layout maps each stored quantity to
 *           {offset, length}: byte offset from the start of the data section, count of float64
 *   zero bytes up to the next multiple of 8 (so the blocks can be viewed in place)
 *   data    little-endian float64 blocks, row-major like DeviceTable.data
 */
export const MAGIC = 'stackwright-table 1';

export interface BlockLayout {
  offset: number;
  length: number;
}

export interface TableHeader {
  meta: TableMeta;
  axes: Record<Axis, number[]>;
  layout: Partial<Record<StoredQuantity, BlockLayout>>;
}

const LITTLE = endianness() === 'LE';
const align8 = (n: number): number => (n + 7) & ~7;

/** Serialises a validated table; `where` names it in errors. */
export function encodeTable(table: DeviceTable, where: string): Uint8Array {
  const chunks = encodeTableChunks(table, where);
  const out = new Uint8Array(chunks.reduce((n, c) => n + c.length, 0));
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.length;
  }
  return out;
}

/**
 * The same bytes as encodeTable, as pieces to write one after another: the
 * padded header, then each data block, on little-endian machines a view of the
 * table's own arrays (a large table is not copied once more just to be written).
 */
export function encodeTableChunks(table: DeviceTable, where: string): Uint8Array[] {
  validateTable(table, where);
  const size = tableSize(table.axes);
  const layout: TableHeader['layout'] = {};
  const order = STORED.filter((q) => table.data[q] !== undefined);
  order.forEach((q, k) => (layout[q] = { offset: k * size * 8, length: size }));
  const axes = Object.fromEntries(AXES.map((a) => [a, Array.from(table.axes[a])])) as Record<Axis, number[]>;
  const header: TableHeader = { meta: table.meta, axes, layout };
  const text = Buffer.from(`${MAGIC}\n${JSON.stringify(header)}\n`, 'utf8');
  const head = new Uint8Array(align8(text.length));
  head.set(text, 0);
  return [head, ...order.map((q) => blockBytes(table.data[q] as Float64Array))];
}

function blockBytes(arr: Float64Array): Uint8Array {
  if (LITTLE) return new Uint8Array(arr.buffer, arr.byteOffset, arr.byteLength);
  const out = new Uint8Array(arr.byteLength);
  const dv = new DataView(out.buffer);
  for (let i = 0; i < arr.length; i++) dv.setFloat64(8 * i, arr[i], true);
  return out;
}

/** Parses lines 1-2; returns the header and where the data section starts. */
export function decodeHeader(buf: Uint8Array, file: string): { header: TableHeader; dataStart: number } {
  const fail = (msg: string): never => {
    throw new StackwrightError(msg, { where: file });
  };
  const nl1 = buf.indexOf(10);
  const first = Buffer.from(buf.buffer, buf.byteOffset, nl1 < 0 ? Math.min(buf.length, 64) : nl1).toString('latin1');
  if (first !== MAGIC) {
    if (first.startsWith('stackwright-table ')) fail(`table format "${first}" is not supported; this build reads "${MAGIC}"`);
    fail(`not a stackwright table (first line should be "${MAGIC}")`);
  }
  const nl2 = buf.indexOf(10, nl1 + 1);
  if (nl2 < 0) fail('table header line is not terminated (file truncated?)');
  let header: TableHeader;
  try {
    header = JSON.parse(Buffer.from(buf.buffer, buf.byteOffset + nl1 + 1, nl2 - nl1 - 1).toString('utf8')) as TableHeader;
  } catch (e) {
    return fail(`table header (line 2) is not valid JSON: ${(e as Error).message}`);
  }
  if (header === null || typeof header !== 'object' || !header.axes || !header.layout) {
    fail('table header (line 2) needs "meta", "axes" and "layout"');
  }
  checkMeta(header.meta, file);
  for (const a of AXES) if (!Array.isArray(header.axes[a])) fail(`table header axis ${a} is not a list of numbers`);
  checkAxes(header.axes, file);
  const dataStart = align8(nl2 + 1);
  for (let i = nl2 + 1; i < Math.min(dataStart, buf.length); i++) if (buf[i] !== 0) fail('padding after the header is not zero');
  return { header, dataStart };
}

/** Checks each block against the axes and the file size; returns the bytes the data section must have. */
export function checkLayout(header: TableHeader, dataBytes: number, file: string): void {
  const fail = (msg: string): never => {
    throw new StackwrightError(msg, { where: file });
  };
  const size = tableSize(toTyped(header.axes));
  const keys = Object.keys(header.layout);
  if (!keys.includes('id')) fail('table has no id block');
  let need = 0;
  for (const q of keys) {
    if (!(STORED as readonly string[]).includes(q)) fail(`layout names unknown quantity "${q}"`);
    const b = header.layout[q as StoredQuantity] as BlockLayout;
    if (!b || !Number.isInteger(b.offset) || b.offset < 0 || b.offset % 8 !== 0) fail(`layout of ${q} has a bad offset`);
    if (b.length !== size) fail(`block ${q} holds ${b.length} values, the axes need ${size}`);
    need = Math.max(need, b.offset + 8 * b.length);
  }
  if (dataBytes < need) fail(`file is truncated: the data blocks need ${need} bytes, the file has ${dataBytes}`);
  if (dataBytes > need) fail(`file has ${dataBytes - need} unexpected bytes after the data blocks`);
}

/** Parses a whole .swtab file held in memory. */
export function decodeTable(buf: Uint8Array, file: string): DeviceTable {
  const { header, dataStart } = decodeHeader(buf, file);
  checkLayout(header, Math.max(0, buf.length - dataStart), file);
  const data: Partial<Record<StoredQuantity, Float64Array>> = {};
  for (const q of STORED) {
    const b = header.layout[q];
    if (b) data[q] = readBlock(buf, dataStart + b.offset, b.length);
  }
  const table: DeviceTable = { meta: header.meta, axes: toTyped(header.axes), data: data as DeviceTable['data'] };
  validateTable(table, file);
  return table;
}

function readBlock(buf: Uint8Array, at: number, n: number): Float64Array {
  const abs = buf.byteOffset + at;
  if (LITTLE && abs % 8 === 0) return new Float64Array(buf.buffer, abs, n);
  if (LITTLE) return new Float64Array(buf.buffer.slice(abs, abs + 8 * n));
  const dv = new DataView(buf.buffer, buf.byteOffset);
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = dv.getFloat64(at + 8 * i, true);
  return out;
}

function toTyped(axes: Record<Axis, number[]>): Record<Axis, Float64Array> {
  return Object.fromEntries(AXES.map((a) => [a, Float64Array.from(axes[a])])) as Record<Axis, Float64Array>;
}
