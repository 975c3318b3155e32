import { StackwrightError, at } from '../errors.js';
import { showText } from '../units/index.js';
import { badCell, readCell } from './cell.js';
import { outOfRange } from './limits.js';
import { cellEnd, readNumberCell } from './number-bytes.js';
import type { ColumnSpec } from './headers.js';

/** What the byte reader needs about the columns, in flat arrays for the hot loop. */
export interface ByteColumns {
  /** Header cell count. */
  cells: number;
  /** For each header cell, the column it fills, or -1 when not read. */
  column: Int32Array;
  specs: ColumnSpec[];
  store: Float64Array[];
  scale: Float64Array;
  positive: Uint8Array;
  limit: Float64Array;
}

export interface ByteRows {
  bytes: Uint8Array;
  /** Byte where the first line after the header starts, and that line's number. */
  from: number;
  firstLine: number;
  delimiter: number;
  decimalComma: boolean;
  file: string;
  /** 1-based physical line of each row (filled). */
  lines: Int32Array;
  /** Location of cell `index` of physical line `line`, for messages. */
  whereCell: (line: number, index: number) => string;
  progress?: (line: number) => void;
  progressEvery: number;
}

const text = (b: Uint8Array, from: number, to: number) => Buffer.from(b.buffer, b.byteOffset + from, to - from).toString('utf8');

/**
 * The data rows of delimited text without quotes, read straight from the bytes
 * (UTF-8; delimiters, digits and line ends are ASCII): no string per line or
 * cell, numbers parsed in place, cells no column needs skipped. Same rules as
 * the text reader: `#`/`*` comment and blank lines skipped, LF or CRLF, a
 * trailing empty cell tolerated, a cell the plain number syntax does not cover
 * (SPICE suffix, decimal comma) read by the general cell reader. Returns the row count.
 */
export function readRowsFromBytes(r: ByteRows, c2: ByteColumns): number {
  const b = r.bytes;
  const n = b.length;
  const d = r.delimiter;
  if (d === 10 || d === 13) throw new Error('line ends cannot separate cells');
  const { column, store, scale, positive, limit } = c2;
  const cells = c2.cells;
  let rows = 0;
  let line = r.firstLine - 1;
  let pos = r.from;
  const tab = d === 9 ? -1 : 9;
  while (pos < n) {
    line++;
    let p = pos;
    let c = b[p];
    while (c === 32 || c === tab || c === 13) c = ++p < n ? b[p] : 10;
    if (c === 10 || c === 35 || c === 42) {
      // blank line, or '#' / '*' comment
      const lf = c === 10 ? p : b.indexOf(10, p);
      pos = lf < 0 ? n : lf + 1;
      continue;
    }
    let cell = 0;
    let failedAt = -1; // header cell whose number did not parse
    let i = pos;
    for (;;) {
      const start = i;
      const j = cell < cells ? column[cell] : -1;
      if (j >= 0) {
        let v = readNumberCell(b, i, n, d);
        i = cellEnd;
        if (v !== v) {
          v = readCell(text(b, start, i), r.decimalComma);
          if (v !== v && failedAt < 0) failedAt = cell;
        }
        if (failedAt < 0) {
          v *= scale[j];
          if (positive[j] === 1 && !(v > 0)) {
            const what = c2.specs[j].quantity === 'l' ? 'length' : 'width';
            throw new StackwrightError(`column ${showText(c2.specs[j].header)}: ${what} must be positive, got ${showText(text(b, start, i).trim())}`, { where: r.whereCell(line, cell) });
          }
          // Huge but finite values would overflow later (1 nV snapping, ln id): refuse them here, located.
          if (!(v <= limit[j] && v >= -limit[j])) throw outOfRange(text(b, start, i), c2.specs[j].header, c2.specs[j].quantity, v, r.whereCell(line, cell));
          store[j][rows] = v;
        }
      } else {
        while (i < n && b[i] !== d && b[i] !== 10) i++;
        if (cell >= cells && !blank(b, start, i)) {
          cell = -1; // a filled cell beyond the header: too many cells
          break;
        }
      }
      cell++;
      if (i >= n || b[i] === 10) break;
      i++; // past the delimiter
    }
    let lf = cell < 0 ? b.indexOf(10, i) : i;
    if (lf < 0) lf = n;
    if (cell < 0 || cell < cells || failedAt >= 0) {
      if (cell >= 0 && cell < cells) throw new StackwrightError(`expected ${cells} cells as in the header, found ${cell}`, { where: at(r.file, line) });
      const eol = lf > pos && b[lf - 1] === 13 ? lf - 1 : lf; // a CR belongs to the line end, not the last cell
      if (cell < 0) throw new StackwrightError(`expected ${cells} cells as in the header, found ${countCells(b, pos, eol, d)}`, { where: at(r.file, line) });
      const j = column[failedAt];
      const [s, e] = cellSpan(b, pos, eol, d, failedAt);
      throw badCell(text(b, s, e), c2.specs[j].header, r.whereCell(line, failedAt));
    }
    r.lines[rows++] = line;
    if (r.progress && rows % r.progressEvery === 0) r.progress(line);
    pos = lf + 1;
  }
  return rows;
}

function blank(b: Uint8Array, from: number, to: number): boolean {
  for (let i = from; i < to; i++) if (b[i] !== 32 && b[i] !== 9) return false;
  return true;
}

function countCells(b: Uint8Array, from: number, to: number, d: number): number {
  let k = 1;
  for (let i = from; i < to; i++) if (b[i] === d) k++;
  return k;
}

function cellSpan(b: Uint8Array, from: number, to: number, d: number, index: number): [number, number] {
  let s = from;
  for (let k = 0; k < index; k++) {
    while (s < to && b[s] !== d) s++;
    s++;
  }
  let e = s;
  while (e < to && b[e] !== d) e++;
  return [s, e];
}

/** Physical lines in bytes[from..]: line feeds, plus a last line without one. */
export function countLinesBytes(b: Uint8Array, from: number): number {
  let n = 0;
  for (let i = b.indexOf(10, from); i >= 0; i = b.indexOf(10, i + 1)) n++;
  return b.length > from && b[b.length - 1] !== 10 ? n + 1 : n;
}
