import type { VdsMode } from '../../stack/invert.js';
import type { LengthSlice } from '../../device/types.js';
import { covers, saturationVoltage } from '../../stack/index.js';
import type { SolveContext } from '../context.js';
import { pelgromSigma } from '../evaluate/mismatch.js';
import { SWEEP_TOP, sweepVgs, type Sweep } from './sweep.js';

import type { StageBias, StageOption } from '../../topology/types.js';

/** VGS sweeps of one slice by VDS mode, then VSB (exact numbers as keys: a sweep depends on nothing else). */
type SliceSweeps = Map<VdsMode, Map<number, Sweep | null>>;


// Sweeps depend only on the slice and the bias, so stacks sizing on the same slices share them (keyed by the
// slice object: they go with it). Past this many in all (1 to 2 kB each) every one is dropped and rebuilt on demand.
const MAX_SWEEPS = 8192;
let shared = new WeakMap<LengthSlice, SliceSweeps>();
let held = 0;

function sweepOf(slice: LengthSlice, mode: VdsMode, vsb: number): Sweep | null {
  if (held >= MAX_SWEEPS) {
    shared = new WeakMap();
    held = 0;
  }
  let byMode = shared.get(slice);
  if (!byMode) shared.set(slice, (byMode = new Map()));
  let byVsb = byMode.get(mode);
  if (!byVsb) byMode.set(mode, (byVsb = new Map()));
  let s = byVsb.get(vsb);
  if (s === undefined) {
    byVsb.set(vsb, (s = sweepVgs(slice, mode, vsb)));
    held++;
  }
  return s;
}

const buf = new Float64Array(4);
const small3 = new Float64Array(3);

/**
 * What a length's options at one bias share, for their saturation voltage on demand. A class, not a literal: these
 * live as long as their options, and a literal's allocation site would be switched to old-space allocation at some
 * scavenge, throwing away the optimised fillLength that makes them.
 */
class SatAt {
  constructor(
    readonly slice: LengthSlice,
    readonly vsb: number,
    readonly ut: number,
  ) {}
}

/**
 * One device choice; `sat` (a table scan per new VSB) is worked out only when
 * read, as only lower devices are judged by it.
 */
class Option implements StageOption {
  private satValue: number;
  constructor(
    readonly l: number,
    readonly gmid: number,
    readonly w: number,
    readonly area: number,
    readonly vgs: number,
    readonly ro: number,
    readonly gmt: number,
    readonly vdsat: number,
    readonly sigma: number,
    sat: number,
    private readonly at: SatAt,
  ) {
    this.satValue = sat;
  }

  get sat(): number {
    if (Number.isNaN(this.satValue)) this.satValue = saturationVoltage(this.at.slice, this.gmid, this.at.vsb, this.at.ut);
    return this.satValue;
  }
}

/**
 * Options of one device over the L × gm/ID grid of a context, by bias, each
 * built when first asked for. Every value depends only on the bias and what a
 * context's derivatives share (slices, lengths, gm/ID grid, current, minimum
 * width, Pelgrom coefficients), so the screens of one stack (its search, the
 * nearest-point scan, the topologies of 'auto', a gain stage's side at each of
 * its headroom shares) build each option once.
 */
interface Family {
  lengths: readonly number[];
  gmids: readonly number[];
  current: number;
  wmin: number;
  coeff: SolveContext['coeff'];
  /** Every position of the gm/ID grid, in order. */
  every: readonly number[];
  byBias: Map<string, Built>;
}

/** One bias: option per (length, gm/ID) slot (null: none there; undefined: not built yet), and the lists handed out. */
interface Built {
  slots: (Option | null | undefined)[];
  /** By gm/ID positions and width limit. */
  lists: Map<string, StageOption[]>;
}

// Keyed by the context's slice accessor: made once per context and shared by every context derived from it.
const families = new WeakMap<SolveContext['slice'], Family>();

function familyOf(ctx: SolveContext): Family {
  let f = families.get(ctx.slice);
  if (!f || f.lengths !== ctx.lengths || f.gmids !== ctx.gmids || f.current !== ctx.spec.current || f.wmin !== ctx.wmin || f.coeff !== ctx.coeff) {
    const every = ctx.gmids.map((_, j) => j);
    f = { lengths: ctx.lengths, gmids: ctx.gmids, current: ctx.spec.current, wmin: ctx.wmin, coeff: ctx.coeff, every, byBias: new Map() };
    families.set(ctx.slice, f);
  }
  return f;
}

/**
 * Options for one device over the L × gm/ID grid. gm/ID fixes VGS at the
 * design bias (VDS `mode`, `vsb`); W = I / jd. Small-signal values come from
 * the design bias, or from `smallAt` (another VDS at the same VGS) when given.
 * Options narrower than the minimum width, and lower devices below their
 * VDSsat, are left out (the exact evaluation would reject them).
 * The list is shared by later calls asking the same: read it, do not change it.
 */
export function stageOptions(ctx: SolveContext, at: StageBias): readonly StageOption[] {
  const gmids = at.gmids ?? ctx.gmids;
  const lower = at.lower === true && ctx.saturation === 'require';
  const fam = familyOf(ctx);
  // Positions of the asked gm/ID values in the context's grid.
  let pos = fam.every;
  if (gmids !== ctx.gmids) {
    const p: number[] = [];
    for (let k = 0; k < gmids.length; k++) {
      const j = ctx.gmids.indexOf(gmids[k]);
      // A value off the grid: built for this call only.
      if (j < 0) return uncached(ctx, fam, at, lower, gmids);
      p.push(j);
    }
    pos = p;
  }
  const key = `${at.mode}|${at.vsb}|${at.smallAt}|${lower}`;
  let built = fam.byBias.get(key);
  if (!built) fam.byBias.set(key, (built = { slots: new Array(ctx.lengths.length * ctx.gmids.length).fill(undefined), lists: new Map() }));
  const list = `${pos === fam.every ? '*' : pos.join(',')}|${ctx.wmax}`;
  let out = built.lists.get(list);
  if (!out) built.lists.set(list, (out = withinWidth(ctx, build(ctx, fam, askOf(ctx, at, lower), ctx.gmids, pos, built.slots))));
  return out;
}

function uncached(ctx: SolveContext, fam: Family, at: StageBias, lower: boolean, gmids: readonly number[]): StageOption[] {
  const slots: (Option | null | undefined)[] = new Array(ctx.lengths.length * gmids.length).fill(undefined);
  return withinWidth(ctx, build(ctx, fam, askOf(ctx, at, lower), gmids, gmids.map((_, j) => j), slots));
}

/**
 * What fillLength reads of an ask: one shape whatever literal the caller wrote, so its loads see one map, and the
 * VDS mode as a flag and a number (NaN for a diode), so no field changes representation when the first diode is asked
 * (which would throw away the code optimised until then).
 */
interface Ask {
  diode: boolean;
  vds: number;
  vsb: number;
  smallAt: number | undefined;
  lower: boolean;
  ut: number;
}

function askOf(ctx: SolveContext, at: StageBias, lower: boolean): Ask {
  const diode = at.mode === 'diode';
  return { diode, vds: diode ? NaN : (at.mode as number), vsb: at.vsb, smallAt: at.smallAt, lower, ut: ctx.ut(ctx.nominal) };
}

// The options at gm/ID positions `pos` of every length, built into `slots` (n = gmids.length per length) where missing.
function build(ctx: SolveContext, fam: Family, ask: Ask, gmids: readonly number[], pos: readonly number[], slots: (Option | null | undefined)[]): Option[] {
  const n = gmids.length;
  const all: Option[] = [];
  for (let li = 0; li < fam.lengths.length; li++) {
    const l = fam.lengths[li];
    fillLength(fam, ask, l, ctx.slice(ctx.nominal, l), gmids, pos, slots, li * n);
    for (let k = 0; k < pos.length; k++) {
      const o = slots[li * n + pos[k]];
      if (o) all.push(o);
    }
  }
  return all;
}

// Options within the width limit when there are any; else all, so the nearest design can show the limit binding.
function withinWidth(ctx: SolveContext, all: Option[]): StageOption[] {
  const wmax = ctx.wmax;
  let fit = 0;
  for (let k = 0; k < all.length; k++) if (all[k].w <= wmax) fit++;
  if (fit === 0 || fit === all.length) return all;
  const out: Option[] = [];
  for (let k = 0; k < all.length; k++) if (all[k].w <= wmax) out.push(all[k]);
  return out;
}

/**
 * Build the options of length l (its slice) at gm/ID values gmids[p], p in
 * `pos`, into slots[base + p] where not built yet. A sweep scan finds the same
 * crossing whichever lower target it resumed from, so an option does not
 * depend on which others were built with it. Reads the family and the ask, not
 * the context (contexts and specs come in several shapes).
 */
function fillLength(
  fam: Family, ask: Ask, l: number, slice: LengthSlice,
  gmids: readonly number[], pos: readonly number[], slots: (Option | null | undefined)[], base: number,
): void {
  const { diode, vds, vsb, smallAt, lower, ut } = ask;
  // VDSsat ≥ 4·UT at any inversion level: no lower device fits below that.
  const none = lower && !diode && vds < 4 * ut;
  const nom = none ? null : sweepOf(slice, diode ? 'diode' : vds, vsb);
  const satAt = new SatAt(slice, vsb, ut);
  // Targets usually ascend: each scan resumes where the last one stopped (see Sweep.stop).
  let from = SWEEP_TOP;
  let prev = -Infinity;
  for (let k = 0; k < pos.length; k++) {
    const p = pos[k];
    if (slots[base + p] !== undefined) continue;
    slots[base + p] = null;
    if (!nom) continue;
    const gmid = gmids[p];
    if (!(gmid >= prev)) from = SWEEP_TOP;
    prev = gmid;
    const hit = nom.atGmid(gmid, from);
    from = nom.stop;
    if (!hit) continue;
    const vgs = nom.crossVgs();
    const w = fam.current / nom.crossJd();
    if (w < fam.wmin) continue;
    const sat = lower ? saturationVoltage(slice, gmid, vsb, ut) : NaN;
    if (lower && sat > (diode ? vgs : vds)) continue;
    let gm: number, gds: number, gmb: number;
    if (smallAt === undefined) {
      nom.crossSmall(small3);
      gm = small3[0];
      gds = small3[1];
      gmb = small3[2];
    } else {
      // One lookup per option at the other VDS beats a shared sweep there (fewer options than sweep points).
      if (!covers(slice, vgs, smallAt, vsb)) continue;
      const r = slice.small(vgs, smallAt, vsb, buf);
      gm = r[1];
      gds = r[2];
      gmb = r[3];
    }
    slots[base + p] = new Option(
      l, gmid, w, w * l, vgs,
      1 / (gds * w),
      (gm + gmb) * w,
      Math.max(2 / gmid, 0.1),
      fam.coeff ? pelgromSigma(gmid, w, l, fam.coeff) : 0,
      sat, satAt,
    );
  }
}

/**
 * Drop options another option beats on every listed criterion (all to be
 * minimised): lossless for a screen whose estimate is monotone in them.
 * The same set, in input order, as numeric/pareto's nonDominated (ties all
 * kept), found faster: in lexicographic order of the criteria anything that
 * dominates an option comes before it, and so does something non-dominated
 * that does (dominance is a strict order), so each option is checked against
 * the front found so far only. With a NaN criterion (no strict order) every pair is compared.
 */
export function prune<T>(items: readonly T[], crit: ((t: T) => readonly number[]) & { readonly size?: number; readonly into?: (t: T, out: Float64Array, at: number) => void }): T[] {
  const n = items.length;
  if (n < 2) return items.slice();
  let k: number;
  let c: Float64Array;
  if (crit.into && crit.size !== undefined) {
    k = crit.size;
    c = new Float64Array(n * k);
    for (let a = 0; a < n; a++) crit.into(items[a], c, a * k);
  } else {
    const first = crit(items[0]);
    k = first.length;
    c = new Float64Array(n * k);
    for (let a = 0; a < n; a++) {
      const v = a === 0 ? first : crit(items[a]);
      for (let q = 0; q < k; q++) c[a * k + q] = v[q];
    }
  }
  let nan = false;
  for (let q = 0; q < n * k; q++) if (Number.isNaN(c[q])) nan = true;
  const keep = new Uint8Array(n);
  if (nan) everyPair(c, k, n, keep);
  else if (k === 2) sweepTwo(c, lexOrder(c, k, n), keep);
  else skyline(c, k, lexOrder(c, k, n), keep);
  const kept: T[] = [];
  for (let a = 0; a < n; a++) if (keep[a]) kept.push(items[a]);
  return kept;
}

// Indices 0..n−1 in lexicographic order of the rows of c (no NaN in c).
function lexOrder(c: Float64Array, k: number, n: number): number[] {
  const order = new Array<number>(n);
  for (let a = 0; a < n; a++) order[a] = a;
  return order.sort((a, b) => {
    for (let q = 0; q < k; q++) {
      const x = c[a * k + q];
      const y = c[b * k + q];
      // Equal values (infinities too) are equal; a sign, not the difference, so nothing is boxed.
      if (x < y) return -1;
      if (x > y) return 1;
    }
    return 0;
  });
}

// keep[a] = 1 for the rows no other row dominates, comparing every pair.
function everyPair(c: Float64Array, k: number, n: number, keep: Uint8Array): void {
  for (let a = 0; a < n; a++) {
    let out = false;
    for (let b = 0; b < n && !out; b++) out = b !== a && dominates(c, k, b, a);
    keep[a] = out ? 0 : 1;
  }
}

// The same for any k, rows visited in lexicographic order: each checked against the non-dominated rows before it.
function skyline(c: Float64Array, k: number, order: readonly number[], keep: Uint8Array): void {
  const front: number[] = [];
  for (let i = 0; i < order.length; i++) {
    const a = order[i];
    let out = false;
    for (let f = 0; f < front.length && !out; f++) out = dominates(c, k, front[f], a);
    if (!out) {
      front.push(a);
      keep[a] = 1;
    }
  }
}

/**
 * The same for two criteria in one pass over the lexicographic order: a row is
 * dominated by an earlier one with a smaller first criterion and a second no
 * larger, or with an equal first criterion and a smaller second.
 */
function sweepTwo(c: Float64Array, order: readonly number[], keep: Uint8Array): void {
  // Smallest second criterion over rows with a smaller first one (when there are any).
  let before = Infinity;
  let any = false;
  let i = 0;
  while (i < order.length) {
    const x = c[2 * order[i]];
    // A run of equal first criteria: its first row has the run's smallest second one.
    const least = c[2 * order[i] + 1];
    let j = i;
    for (; j < order.length && c[2 * order[j]] === x; j++) {
      const y = c[2 * order[j] + 1];
      if (!(any && before <= y) && !(least < y)) keep[order[j]] = 1;
    }
    if (least < before) before = least;
    any = true;
    i = j;
  }
}

// Row b of c no worse than row a everywhere and strictly better somewhere (NaN compares false).
function dominates(c: Float64Array, k: number, b: number, a: number): boolean {
  const ob = b * k;
  const oa = a * k;
  let strictly = false;
  for (let q = 0; q < k; q++) {
    const x = c[ob + q];
    const y = c[oa + q];
    if (x > y) return false;
    if (x < y) strictly = true;
  }
  return strictly;
}
