import { StackwrightError } from '../errors.js';
import { STORED, type StoredQuantity } from '../table/types.js';
import { formatEng } from '../units/index.js';
import type { Samples } from './types.js';

/** All rows of all files at the chosen width, voltages snapped to 1 nV. */
export interface Pool {
  n: number;
  l: Float64Array;
  vgs: Float64Array;
  vds: Float64Array;
  vsb: Float64Array;
  data: Partial<Record<StoredQuantity, Float64Array>> & { id: Float64Array };
  /** Physical line and file index of each row, for messages. */
  line: Int32Array;
  file: Uint16Array;
  files: string[];
  width: number;
  notes: string[];
}

/** Relative 1e-9 rounding for lengths and widths (memoised: files repeat few values). */
export function sizeKeyer(): (x: number) => number {
  const memo = new Map<number, number>();
  return (x) => {
    let k = memo.get(x);
    if (k === undefined) {
      k = Number(x.toPrecision(10));
      memo.set(x, k);
    }
    return k;
  };
}

export function snapVolt(v: number): number {
  const r = Math.round(v * 1e9) / 1e9;
  return r === 0 ? 0 : r;
}

/** Width of every row: the w column, else the --width option. */
function widthsOf(s: Samples, width: number | undefined): { w?: Float64Array; fixed?: number } {
  if (s.columns.w) return { w: s.columns.w };
  return { fixed: width };
}

export function choosePool(samples: Samples[], width: number | undefined): Pool {
  const key = sizeKeyer();
  const files = samples.map((s) => s.file);
  const seen = new Set<number>();
  for (const s of samples) {
    const { w, fixed } = widthsOf(s, width);
    if (w) for (let i = 0; i < w.length; i++) seen.add(key(w[i]));
    else if (fixed !== undefined) seen.add(key(fixed));
  }
  const shown = [...seen].sort((a, b) => a - b).map((x) => formatEng(x, 'm', 4)).join(', ');
  if (width === undefined && seen.size > 1) {
    throw new StackwrightError(`mixed widths in ${files.join(', ')} (${shown}): pass --width to choose one or split the files`, { where: files[0] });
  }
  const chosen = width === undefined ? [...seen][0] : key(width);
  if (!seen.has(chosen)) {
    throw new StackwrightError(`no rows at width ${formatEng(width!, 'm', 4)}; widths in the files: ${shown}`, { where: '--width' });
  }

  // Quantities every file has; the rest are dropped (and may be derived later).
  const notes: string[] = [];
  const common = STORED.filter((q) => samples.every((s) => s.columns[q] !== undefined));
  for (const q of STORED) {
    const some = samples.filter((s) => s.columns[q] !== undefined);
    if (some.length > 0 && some.length < samples.length) notes.push(`${q} ignored: not in every file`);
  }

  const keep = samples.map((s) => {
    const w = s.columns.w;
    if (!w) return undefined; // every row kept
    const mask = new Uint8Array(s.rows);
    for (let i = 0; i < s.rows; i++) mask[i] = key(w[i]) === chosen ? 1 : 0;
    return mask;
  });
  let n = 0;
  samples.forEach((s, k) => {
    const m = keep[k];
    if (!m) n += s.rows;
    else for (let i = 0; i < m.length; i++) n += m[i];
  });

  if (samples.length === 1 && n === samples[0].rows) return inPlace(samples[0], common, chosen, notes);
  const alloc = () => new Float64Array(n);
  const pool: Pool = {
    n,
    l: alloc(), vgs: alloc(), vds: alloc(), vsb: alloc(),
    data: { id: alloc() },
    line: new Int32Array(n),
    file: new Uint16Array(n),
    files,
    width: chosen,
    notes,
  };
  for (const q of common) if (q !== 'id') pool.data[q] = alloc();
  let r = 0;
  samples.forEach((s, k) => {
    const m = keep[k];
    const c = s.columns;
    for (let i = 0; i < s.rows; i++) {
      if (m && !m[i]) continue;
      pool.l[r] = key(c.l[i]);
      pool.vgs[r] = snapVolt(c.vgs[i]);
      pool.vds[r] = snapVolt(c.vds[i]);
      pool.vsb[r] = snapVolt(c.vsb[i]);
      for (const q of common) pool.data[q]![r] = c[q]![i];
      pool.line[r] = s.lines[i];
      pool.file[r] = k;
      r++;
    }
  });
  return pool;
}

/** One file, every row kept: snap its own arrays instead of copying (a 1M-row file is ~100 MB of columns). */
function inPlace(s: Samples, common: StoredQuantity[], width: number, notes: string[]): Pool {
  const key = sizeKeyer();
  const c = s.columns;
  for (let i = 0; i < s.rows; i++) {
    c.l[i] = key(c.l[i]);
    c.vgs[i] = snapVolt(c.vgs[i]);
    c.vds[i] = snapVolt(c.vds[i]);
    c.vsb[i] = snapVolt(c.vsb[i]);
  }
  const data = { id: c.id } as Pool['data'];
  for (const q of common) data[q] = c[q]!;
  return { n: s.rows, l: c.l, vgs: c.vgs, vds: c.vds, vsb: c.vsb, data, line: s.lines, file: new Uint16Array(s.rows), files: [s.file], width, notes };
}
