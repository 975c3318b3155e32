import { StackwrightError, at } from '../errors.js';
import { formatEng, showText } from '../units/index.js';
import { badCell, radixLiteral, readCell } from './cell.js';
import { cellColumn, detectDelimiter, type Delimiter } from './delimiter.js';
import { checkMap, matchHeaders, type ColumnSpec } from './headers.js';
import { limitOf, outOfRange } from './limits.js';
import { allZero, checkPlausible, magnitudeRange, oppositeSignRow } from './plausible.js';
import type { CellPlaces } from './quoted.js';
import { forEachRow } from './rows.js';
import { showList } from './show.js';
import { mostlyNegativeAt, normaliseSigns } from './signs.js';
import { checkLineEnds, countLines, decodeInput, findHeader, isCommentOrBlank, lineAt } from './text.js';
import { countLinesBytes, readRowsFromBytes } from './parse-bytes.js';
import type { Quantity, Samples, SweepOptions } from './types.js';

const REQUIRED: readonly Quantity[] = ['l', 'vgs', 'vds', 'id'];
const PROGRESS_EVERY = 65536;

/** One long-format sweep file (any column order) to columns in SI magnitudes. */
export function parseSweep(input: string | Buffer, file: string, opts: SweepOptions): Samples {
  const raw = decodeInput(input, file);
  input = ''; // let a large raw buffer go while the text is parsed
  if (raw.bytes) checkLineEnds(raw.bytes, 10, 13, raw.start, file);
  else checkLineEnds(raw.text, '\n', '\r', 0, file);
  if (raw.bytes) {
    const fast = parseBytes(raw.bytes, raw.start, raw.sha256, file, opts);
    if (fast) return fast;
    return parseText(raw.bytes.toString('utf8', raw.start), raw.sha256, file, opts);
  }
  return parseText(raw.text, raw.sha256, file, opts);
}

/** Column facts for the hot loops, from the header. */
function columnsFor(specs: ColumnSpec[], capacity: number) {
  return {
    store: specs.map(() => new Float64Array(capacity)),
    idx: Int32Array.from(specs, (c) => c.index),
    scale: Float64Array.from(specs, (c) => c.scale),
    positive: Uint8Array.from(specs, (c) => (c.quantity === 'l' || c.quantity === 'w' ? 1 : 0)),
    limit: Float64Array.from(specs, (c) => limitOf(c.quantity)),
  };
}

/**
 * The fast reader: UTF-8 bytes with ',' ';' or tab between cells and no double
 * quote anywhere. Returns undefined for anything else (the text reader takes it).
 */
function parseBytes(bytes: Buffer, start: number, sha256: string, file: string, opts: SweepOptions): Samples | undefined {
  if (bytes.indexOf(34, start) >= 0) return undefined; // quotes: records may span lines
  const head = findHeaderBytes(bytes, start);
  if (!head) return undefined; // the text reader words the error
  const delimiter = detectDelimiter(head.text);
  if (delimiter === 'space') return undefined;
  const map = checkMap(opts.map);
  const totalLines = countLinesBytes(bytes, start);
  const capacity = Math.max(0, totalLines - head.line);
  const lines = new Int32Array(capacity);
  let body: string | undefined;
  const lineText = (line: number) => (line === head.line ? head.text : lineAt((body ??= bytes.toString('utf8', start)), line));
  const whereCell = (line: number, index: number) => at(file, line, cellColumn(lineText(line), delimiter, index));
  const headers = splitHeaderLine(head.text, delimiter);
  const skipped: string[] = [];
  const specs = matchHeaders(headers, map, (i) => whereCell(head.line, i), skipped);
  const headerWhere = specs.map((c) => whereCell(head.line, c.index));
  checkRequired(specs, headers, opts.width, at(file, head.line));
  const cols = columnsFor(specs, capacity);
  const column = new Int32Array(headers.length).fill(-1);
  specs.forEach((c, j) => (column[c.index] = j));
  const progress = opts.onProgress;
  const rows = readRowsFromBytes(
    {
      bytes, from: head.next, firstLine: head.line + 1, delimiter: delimiter.charCodeAt(0), decimalComma: delimiter === ';', file, lines, whereCell,
      progress: progress && ((line) => progress(line, totalLines)), progressEvery: PROGRESS_EVERY,
    },
    { cells: headers.length, column, specs, store: cols.store, scale: cols.scale, positive: cols.positive, limit: cols.limit },
  );
  return finish({ file, sha256, headers, specs, skipped, headerWhere, store: cols.store, rows, lines, headLine: head.line, whereCell, totalLines, opts });
}

/** Header cells split like data cells (papaparse for text without quotes does the same). */
function splitHeaderLine(line: string, delimiter: Delimiter): string[] {
  return line.split(delimiter === 'space' ? /[ \t]+/ : delimiter).map((h) => h.trim());
}

/** First line that is not blank or a comment, from bytes: number, text and where the next line starts. */
function findHeaderBytes(b: Buffer, start: number): { line: number; text: string; next: number } | undefined {
  let pos = start;
  let line = 1;
  while (pos < b.length) {
    let end = b.indexOf(10, pos);
    const next = end < 0 ? b.length : end + 1;
    if (end < 0) end = b.length;
    const s = b.toString('utf8', pos, end).replace(/\r$/, '');
    if (!isCommentOrBlank(s)) return { line, text: s, next };
    pos = next;
    line++;
  }
  return undefined;
}

function parseText(text: string, sha256: string, file: string, opts: SweepOptions): Samples {
  const head = findHeader(text);
  if (!head) {
    throw new StackwrightError(text.trim() === '' ? 'file is empty' : 'no header line (only comments and blank lines)', { where: file });
  }
  const delimiter = detectDelimiter(head.text);
  const map = checkMap(opts.map);
  const totalLines = countLines(text);
  const capacity = Math.max(0, totalLines - head.line);
  const lines = new Int32Array(capacity);
  let headers: string[] = [];
  let specs: ColumnSpec[] = [];
  let headerWhere: string[] = [];
  const skipped: string[] = [];
  let store: Float64Array[] = [];
  let rows = 0;
  const whereCell = (line: number, index: number, places?: CellPlaces): string =>
    places && index < places.length >> 1
      ? at(file, places[2 * index], places[2 * index + 1])
      : at(file, line, cellColumn(lineAt(text, line), delimiter, index));

  // Hot loop: per-column facts in flat arrays, no per-cell closures.
  let idx = new Int32Array(0);
  let scale = new Float64Array(0);
  let positive = new Uint8Array(0);
  let limit = new Float64Array(0);
  const decimalComma = delimiter === ';';
  forEachRow(text, delimiter, file, (fields, line, places) => {
    if (line <= head.line) {
      if (line === head.line) {
        headers = fields.map((h) => h.trim());
        specs = matchHeaders(headers, map, (i) => whereCell(line, i, places), skipped);
        headerWhere = specs.map((c) => whereCell(line, c.index, places));
        checkRequired(specs, headers, opts.width, at(file, line));
        ({ store, idx, scale, positive, limit } = columnsFor(specs, capacity));
      }
      return;
    }
    const f0 = fields[0];
    let c0 = f0.charCodeAt(0);
    if (c0 === 32 || c0 === 9) c0 = f0.trimStart().charCodeAt(0);
    if (c0 === 35 || c0 === 42) return; // '#' or '*' comment
    if (fields.length !== headers.length) {
      if (fields.length === 1 && f0.trim() === '') return; // blank line
      if (!tolerableWidth(fields, headers.length)) {
        throw new StackwrightError(`expected ${headers.length} cells as in the header, found ${fields.length}`, { where: at(file, line) });
      }
    }
    for (let j = 0; j < idx.length; j++) {
      const cell = fields[idx[j]];
      let v = +cell;
      if (v - v !== 0 || (v === 0 && !hasDigit(cell)) || radixLiteral(v, cell)) {
        v = readCell(cell, decimalComma);
        if (v !== v) throw badCell(cell, specs[j].header, whereCell(line, idx[j], places));
      }
      v *= scale[j];
      if (positive[j] === 1 && !(v > 0)) {
        const what = specs[j].quantity === 'l' ? 'length' : 'width';
        throw new StackwrightError(`column ${showText(specs[j].header)}: ${what} must be positive, got ${showText(cell.trim())}`, { where: whereCell(line, idx[j], places) });
      }
      // Huge but finite values would overflow later (1 nV snapping, ln id): refuse them here, located.
      if (!(v <= limit[j] && v >= -limit[j])) throw outOfRange(cell, specs[j].header, specs[j].quantity, v, whereCell(line, idx[j], places));
      store[j][rows] = v;
    }
    lines[rows++] = line;
    if (opts.onProgress && rows % PROGRESS_EVERY === 0) opts.onProgress(line, totalLines);
  });
  return finish({ file, sha256, headers, specs, skipped, headerWhere, store, rows, lines, headLine: head.line, whereCell, totalLines, opts });
}

interface Parsed {
  file: string;
  sha256: string;
  headers: string[];
  specs: ColumnSpec[];
  /** Map keys that left a column out (`--map HEADER=skip`). */
  skipped: string[];
  headerWhere: string[];
  store: Float64Array[];
  rows: number;
  lines: Int32Array;
  headLine: number;
  whereCell: (line: number, index: number) => string;
  totalLines: number;
  opts: SweepOptions;
}

/** Checks on whole columns, vbs to vsb, simulator signs to magnitudes. */
function finish(p: Parsed): Samples {
  const { file, specs, store, rows, lines, whereCell, opts } = p;
  if (rows === 0) throw new StackwrightError('header but no data rows', { where: at(file, p.headLine) });
  const idj = specs.findIndex((s) => s.quantity === 'id');
  if (allZero(store[idj].subarray(0, rows))) {
    throw new StackwrightError(`no device conducts: every drain current (column ${showText(specs[idj].header)}) is zero`, { where: file });
  }
  specs.forEach((s, j) => checkPlausible(s.quantity, s.header, store[j].subarray(0, rows), p.headerWhere[j], (r) => whereCell(lines[r], s.index)));
  const columns = {} as Partial<Record<Quantity, Float64Array>>;
  const source: Partial<Record<Quantity, string>> = {};
  specs.forEach((s, j) => {
    columns[s.quantity] = store[j].subarray(0, rows);
    source[s.quantity] = s.header;
  });
  if (columns.vbs) {
    // vsb = -vbs; PMOS signs are handled below like a vsb column.
    const vbs = columns.vbs;
    for (let i = 0; i < rows; i++) vbs[i] = vbs[i] === 0 ? 0 : -vbs[i];
    columns.vsb = vbs;
    source.vsb = source.vbs;
    delete columns.vbs;
    delete source.vbs;
  }
  if (!columns.vsb) columns.vsb = new Float64Array(rows);
  const cols = columns as Samples['columns'];
  if (opts.device === 'n') refuseNegativeSweep(cols, specs, lines, whereCell);
  normaliseSigns(cols, opts.device);
  const flipped = oppositeSignRow(cols.id);
  if (flipped >= 0) {
    const largest = magnitudeRange(cols.id).max;
    throw new StackwrightError(
      `column ${showText(specs[idj].header)}: this row's drain current (${formatEng(Math.abs(cols.id[flipped]), 'A')}) has the sign opposite to the device's other rows (largest ${formatEng(largest, 'A')}); one device's current has one sign: remove the row or fix its sign`,
      { where: whereCell(lines[flipped], specs[idj].index) },
    );
  }
  opts.onProgress?.(p.totalLines, p.totalLines);
  return {
    file,
    sha256: p.sha256,
    rows,
    columns: cols,
    lines: lines.subarray(0, rows),
    headers: p.headers,
    source,
    mapped: [...specs.filter((s) => s.mapKey !== undefined).map((s) => s.mapKey!), ...p.skipped],
  };
}

/** Mostly negative VGS or VDS is a p-type sweep in simulator signs: read as n-type it made negative axes. */
function refuseNegativeSweep(cols: Samples['columns'], specs: ColumnSpec[], lines: Int32Array, whereCell: (line: number, index: number) => string): void {
  for (const q of ['vgs', 'vds'] as const) {
    const i = mostlyNegativeAt(cols[q]);
    if (i < 0) continue;
    const spec = specs.find((s) => s.quantity === q)!;
    throw new StackwrightError(
      `column ${showText(spec.header)}: most ${q} values are negative, as a p-type sweep in simulator signs has them; an n-type sweep has ${q} >= 0: pass --device p, or fix the sign`,
      { where: whereCell(lines[i], spec.index) },
    );
  }
}

function hasDigit(cell: string): boolean {
  for (let i = 0; i < cell.length; i++) {
    const c = cell.charCodeAt(i);
    if (c >= 48 && c <= 57) return true;
  }
  return false;
}

// A trailing delimiter ("1,2,3,") gives one extra empty cell: accept it.
function tolerableWidth(fields: string[], n: number): boolean {
  if (fields.length < n) return false;
  for (let i = n; i < fields.length; i++) if (fields[i].trim() !== '') return false;
  return true;
}

function checkRequired(specs: ColumnSpec[], headers: string[], width: number | undefined, where: string): void {
  const have = new Set(specs.map((s) => s.quantity));
  if (have.has('vbs')) have.add('vsb');
  const need = width === undefined ? [...REQUIRED, 'w' as const] : REQUIRED;
  const missing = need.filter((q) => !have.has(q));
  if (missing.length === 0) return;
  const seen = showList(headers);
  const hint = missing.includes('w') && missing.length === 1 ? ' (or pass --width)' : ' (use --map HEADER=QUANTITY for other names)';
  throw new StackwrightError(`missing column ${missing.join(', ')}${hint}; headers seen: ${seen}`, { where });
}
