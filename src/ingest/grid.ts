import { StackwrightError, at } from '../errors.js';
import { UNITS, type Axis, type StoredQuantity } from '../table/types.js';
import { formatEng, showValue } from '../units/index.js';
import type { Pool } from './pool.js';
import { commonAxis, resampleLength } from './resample.js';

export interface Gridded {
  axes: Record<Axis, Float64Array>;
  data: Partial<Record<StoredQuantity, Float64Array>> & { id: Float64Array };
  notes: string[];
}

/** One length's own grid and, per grid slot, the pool row there (-1 when missing). */
interface LengthGrid {
  l: number;
  vgs: Float64Array;
  vds: Float64Array;
  vsb: Float64Array;
  slot: Int32Array;
  /** Some row of this length, for messages. */
  firstRow: number;
}

const sorted = (s: Set<number>): Float64Array => Float64Array.from(s).sort();

function indexOf(a: Float64Array): Map<number, number> {
  const m = new Map<number, number>();
  a.forEach((v, i) => m.set(v, i));
  return m;
}

const sameAxis = (a: Float64Array, b: Float64Array): boolean => a.length === b.length && a.every((v, i) => v === b[i]);

export function where(pool: Pool, row: number): string {
  return at(pool.files[pool.file[row]], pool.line[row]);
}

/** Group rows by length, collect each length's own voltage axes, place rows, catch conflicting duplicates. */
export function lengthGrids(pool: Pool): LengthGrid[] {
  const byL = new Map<number, number>();
  const lidx = new Int32Array(pool.n);
  const sets: Array<{ l: number; g: Set<number>; d: Set<number>; s: Set<number>; first: number }> = [];
  // Sweeps repeat l, vgs and vds over long runs of rows: skip the hash lookups while they do.
  let lastL = NaN;
  let lastG = NaN;
  let lastD = NaN;
  let k = -1;
  for (let r = 0; r < pool.n; r++) {
    const l = pool.l[r];
    if (l !== lastL) {
      let found = byL.get(l);
      if (found === undefined) {
        found = sets.length;
        byL.set(l, found);
        sets.push({ l, g: new Set(), d: new Set(), s: new Set(), first: r });
      }
      k = found;
      lastL = l;
      lastG = NaN;
      lastD = NaN;
    }
    lidx[r] = k;
    const t = sets[k];
    const g = pool.vgs[r];
    const d = pool.vds[r];
    if (g !== lastG) t.g.add((lastG = g));
    if (d !== lastD) t.d.add((lastD = d));
    t.s.add(pool.vsb[r]);
  }
  const grids: LengthGrid[] = sets.map((t) => {
    const l = t.l;
    const vgs = sorted(t.g);
    if (vgs.length < 2) {
      throw new StackwrightError(`only one VGS point (${formatEng(vgs[0], 'V')}) at L=${formatEng(l, 'm', 4)}; a table needs a VGS sweep per length`, { where: where(pool, t.first) });
    }
    const vds = sorted(t.d);
    const vsb = sorted(t.s);
    const slot = new Int32Array(vgs.length * vds.length * vsb.length).fill(-1);
    return { l, vgs, vds, vsb, slot, firstRow: t.first };
  });
  const maps = grids.map((g) => [indexOf(g.vgs), indexOf(g.vds), indexOf(g.vsb)] as const);
  const quantities = Object.keys(pool.data) as StoredQuantity[];
  let lastK = -1;
  let ig = 0;
  let id = 0;
  for (let r = 0; r < pool.n; r++) {
    const k = lidx[r];
    const g = grids[k];
    const [mg, md, ms] = maps[k];
    if (k !== lastK) {
      lastK = k;
      lastG = NaN; // reused from the first pass as the last values placed
      lastD = NaN;
    }
    if (pool.vgs[r] !== lastG) ig = mg.get((lastG = pool.vgs[r]))!;
    if (pool.vds[r] !== lastD) id = md.get((lastD = pool.vds[r]))!;
    const s = (ig * g.vds.length + id) * g.vsb.length + ms.get(pool.vsb[r])!;
    const prev = g.slot[s];
    if (prev < 0) g.slot[s] = r;
    else checkDuplicate(pool, quantities, prev, r);
  }
  return grids.sort((a, b) => a.l - b.l);
}

/**
 * Overlapping simulator runs repeat bias points with values that differ in the
 * last printed digits; below this relative difference a repeat is the same
 * point (the first row is kept), above it the rows conflict.
 */
export const DUPLICATE_TOLERANCE = 1e-6;

function checkDuplicate(pool: Pool, quantities: StoredQuantity[], a: number, b: number): void {
  for (const q of quantities) {
    const x = pool.data[q]![a];
    const y = pool.data[q]![b];
    const rel = Math.abs(x - y) / Math.max(Math.abs(x), Math.abs(y));
    if (rel >= DUPLICATE_TOLERANCE) {
      const v = (u: number) => formatEng(u, 'V', 6);
      const point = `L=${formatEng(pool.l[a], 'm', 4)} vgs=${v(pool.vgs[a])} vds=${v(pool.vds[a])} vsb=${v(pool.vsb[a])}`;
      const show = (u: number) => formatEng(u, UNITS[q], 9);
      throw new StackwrightError(
        `bias point ${point} repeats with a different ${q} (${show(x)} vs ${show(y)}, relative difference ${rel.toExponential(1)}, tolerance ${DUPLICATE_TOLERANCE.toExponential(0)}) at ${where(pool, a)} and ${where(pool, b)}`,
        { where: where(pool, b) },
      );
    }
  }
}

/** Lay the pool onto one (l, vgs, vds, vsb) grid, resampling when lengths disagree. */
export function buildGrid(pool: Pool): Gridded {
  const grids = lengthGrids(pool);
  const quantities = Object.keys(pool.data) as StoredQuantity[];
  const l = Float64Array.from(grids.map((g) => g.l));
  const regular = grids.every((g) => sameAxis(g.vgs, grids[0].vgs) && sameAxis(g.vds, grids[0].vds) && sameAxis(g.vsb, grids[0].vsb) && g.slot.every((r) => r >= 0));
  if (regular) {
    const axes = { l, vgs: grids[0].vgs, vds: grids[0].vds, vsb: grids[0].vsb };
    const block = grids[0].slot.length;
    const data = {} as Gridded['data'];
    if (inGridOrder(grids, block, pool.n)) {
      // Rows already sorted l, vgs, vds, vsb (what sweeps usually are): the columns are the grid, no copy.
      for (const q of quantities) data[q] = pool.data[q]!;
      return { axes, data, notes: [] };
    }
    for (const q of quantities) {
      const src = pool.data[q]!;
      const out = new Float64Array(l.length * block);
      grids.forEach((g, il) => {
        for (let s = 0; s < block; s++) out[il * block + s] = src[g.slot[s]];
      });
      data[q] = out;
    }
    return { axes, data, notes: [] };
  }

  const names = ['vgs', 'vds', 'vsb'] as const;
  const common = names.map((a) => commonAxis(grids.map((g) => ({ l: g.l, axis: g[a] })), a, pool.files[pool.file[grids[0].firstRow]]));
  const axes = { l, vgs: common[0].axis, vds: common[1].axis, vsb: common[2].axis };
  if (axes.vgs.length < 2) {
    throw new StackwrightError('the lengths share only one VGS value; a table needs a VGS sweep', { where: pool.files[0] });
  }
  const block = axes.vgs.length * axes.vds.length * axes.vsb.length;
  const data = {} as Gridded['data'];
  for (const q of quantities) data[q] = new Float64Array(l.length * block);
  let missing = 0;
  grids.forEach((g, il) => {
    const file = pool.files[pool.file[g.firstRow]];
    missing += block - sampledOnGrid(g, axes);
    for (const q of quantities) {
      const src = pool.data[q]!;
      const tensor = Float64Array.from(g.slot, (r) => (r < 0 ? NaN : src[r]));
      const logVgs = q === 'id' || q === 'gm' || q === 'gds';
      const out = resampleLength(tensor, [g.vgs, g.vds, g.vsb], [axes.vgs, axes.vds, axes.vsb], logVgs, g.l, file);
      data[q]!.set(out, il * block);
    }
  });
  const own = (a: (typeof names)[number]) => grids.some((g) => sameAxis(g[a], axes[a]));
  const how = names.filter((a) => !own(a)).map((a) => `${a} ${formatAxis(axes[a])}`);
  const notes = [
    `resampled onto a common grid by monotone cubic (PCHIP) interpolation, in ln for id/gm/gds along vgs` +
      (how.length ? `; new axes: ${how.join(', ')}` : '') +
      (missing ? `; ${missing} grid points not sampled at their length were interpolated` : ''),
  ];
  return { axes, data, notes };
}

/** Every row sits at its own index of the row-major grid, and there are no duplicates. */
function inGridOrder(grids: LengthGrid[], block: number, n: number): boolean {
  if (grids.length * block !== n) return false;
  for (let il = 0; il < grids.length; il++) {
    const slot = grids[il].slot;
    const base = il * block;
    for (let s = 0; s < block; s++) if (slot[s] !== base + s) return false;
  }
  return true;
}

function formatAxis(a: Float64Array): string {
  return `${showValue(a[0], 'V')}..${showValue(a[a.length - 1], 'V')} in ${a.length} points`;
}

/** How many points of the common grid this length has a sample at. */
function sampledOnGrid(g: LengthGrid, axes: Record<Axis, Float64Array>): number {
  const on = (src: Float64Array, dst: Float64Array) => Uint8Array.from(src, (v) => (dst.includes(v) ? 1 : 0));
  const ig = on(g.vgs, axes.vgs);
  const id = on(g.vds, axes.vds);
  const is = on(g.vsb, axes.vsb);
  let n = 0;
  for (let a = 0; a < g.vgs.length; a++) {
    for (let b = 0; b < g.vds.length; b++) {
      for (let c = 0; c < g.vsb.length; c++) {
        if (ig[a] && id[b] && is[c] && g.slot[(a * g.vds.length + b) * g.vsb.length + c] >= 0) n++;
      }
    }
  }
  return n;
}
