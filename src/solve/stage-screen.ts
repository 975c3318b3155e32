import type { StageSpec } from '../design/types.js';
import { swingAtGain, swingOnGrid } from '../stack/index.js';
import { crossing } from '../stack/stage-swing.js';
import { TopK } from '../numeric/index.js';
import type { SideDesign } from './stage-side.js';

/** A pair of side designs the screen kept. */
export interface Pair {
  input: SideDesign;
  load: SideDesign;
}

/**
 * Best gain held over a window of `m` grid steps containing the design point,
 * windows aligned with the grid: the lowest gain from the window's start to
 * the design point and from there to its end, by running minima (O(n)).
 */
function gainOverWindow(gains: Float64Array, j0: number, m: number, left: Float64Array, right: Float64Array): number {
  const n = gains.length;
  left[j0] = gains[j0];
  for (let j = j0 - 1; j >= 0; j--) left[j] = Math.min(left[j + 1], gains[j]);
  right[j0] = gains[j0];
  for (let j = j0 + 1; j < n; j++) right[j] = Math.min(right[j - 1], gains[j]);
  let best = 0;
  for (let s = Math.max(0, j0 - m); s <= j0; s++) {
    const e = s + m;
    if (e >= n) break;
    best = Math.max(best, Math.min(left[s], right[e]));
  }
  return best;
}

/** Relative and absolute slack on the bounds below, far above rounding (keeps skipping sound). */
const SLACK = 1e-9;

/**
 * Upper bounds of one side alone on the pair measures: swing at the gain
 * target and gain held over the swing target of a curve that lies above every
 * pair's estimated gain curve (A = gm·(r1 ∥ r2) ≤ gm·r1 and ≤ gm_max·r2).
 * Both measures only grow when the curve rises pointwise. `lo`..`hi`: the grid
 * points around the design point where that curve meets the gain target (empty
 * when it misses there); every pair with this side misses just outside them.
 * `vlow`, `vhigh`: that curve's swing edges (the design point when it misses
 * there). A pair's curve, lying below, crosses the target inside them on the
 * same grid segment or nearer the design point, so its swing edges lie within
 * both sides' edges.
 */
interface Bound {
  swing: number;
  held: number;
  lo: number;
  hi: number;
  vlow: number;
  vhigh: number;
}

function boundOf(stage: StageSpec, curve: Float64Array, vs: Float64Array, j0: number, m: number, left: Float64Array, right: Float64Array): Bound {
  let lo = j0 + 1;
  let hi = j0 - 1;
  if (curve[j0] >= stage.gain) {
    for (lo = j0; lo > 0 && curve[lo - 1] >= stage.gain; lo--);
    for (hi = j0; hi < vs.length - 1 && curve[hi + 1] >= stage.gain; hi++);
  }
  const edges = swingOnGrid(vs, curve, j0, stage.gain);
  const n = vs.length;
  // An infinite Rout makes an interpolated edge NaN: then only the grid points bound (NaN bounds would skip pairs).
  const vlow = edges ? (Number.isFinite(edges.vlow) ? edges.vlow : vs[Math.max(lo - 1, 0)]) : vs[j0];
  const vhigh = edges ? (Number.isFinite(edges.vhigh) ? edges.vhigh : vs[Math.min(hi + 1, n - 1)]) : vs[j0];
  const held = gainOverWindow(curve, j0, m, left, right) * (1 + SLACK);
  return { swing: vhigh - vlow + SLACK, held: Number.isNaN(held) ? Infinity : held, lo, hi, vlow, vhigh };
}

function inputBounds(stage: StageSpec, inputs: readonly SideDesign[], vs: Float64Array, j0: number, m: number, left: Float64Array, right: Float64Array): Bound[] {
  const curve = new Float64Array(vs.length);
  return inputs.map((a) => {
    const gm = a.gm as Float64Array;
    for (let j = 0; j < vs.length; j++) curve[j] = gm[j] > 0 && a.rout[j] > 0 ? gm[j] * a.rout[j] * (1 + SLACK) : 0;
    return boundOf(stage, curve, vs, j0, m, left, right);
  });
}

function loadBounds(stage: StageSpec, loads: readonly SideDesign[], gmMax: number, vs: Float64Array, j0: number, m: number, left: Float64Array, right: Float64Array): Bound[] {
  const curve = new Float64Array(vs.length);
  return loads.map((b) => {
    for (let j = 0; j < vs.length; j++) curve[j] = b.rout[j] > 0 ? gmMax * b.rout[j] * (1 + SLACK) : 0;
    return boundOf(stage, curve, vs, j0, m, left, right);
  });
}

// Estimated gain at one grid point from the input's gm and Rout and the load's Rout:
// gm_in·(Rout_in ∥ Rout_load) (parallel() inlined), 0 where a side is not coverable.
function gainOf(g: number, r1: number, r2: number): number {
  return g > 0 && r1 > 0 && r2 > 0 ? g * (r1 === Infinity ? r2 : r2 === Infinity ? r1 : (r1 * r2) / (r1 + r2)) : 0;
}

// True when a key of at least `lower` could still enter the pool (it keeps the k smallest, first come on ties).
function could(pool: TopK<number>, lower: number): boolean {
  const worst = pool.worst();
  return worst === undefined || !(lower - SLACK >= worst);
}

/** Lowest swing a pair needs to enter the pool of swing keys −swing + tie (−Infinity while it is not full). */
function swingNeed(pool: TopK<number>, tie: number): number {
  const worst = pool.worst();
  return worst === undefined ? -Infinity : tie - worst - SLACK;
}

/**
 * Pairs numbered ia·loads + ib in order of area: Float64Array's own sort (no
 * comparator calls), each pair's number riding in the low 32 bits of its
 * area (a relative change below 1e-6). The order only steers how soon the
 * pools fill; they keep the same pairs in any order.
 */
function areaOrder(inputs: readonly SideDesign[], loads: readonly SideDesign[]): Uint32Array {
  const nb = loads.length;
  const keys = new Float64Array(inputs.length * nb);
  const words = new Uint32Array(keys.buffer);
  const low = new Uint8Array(new Uint32Array([1]).buffer)[0] === 1 ? 0 : 1;
  for (let ia = 0; ia < inputs.length; ia++) {
    for (let ib = 0; ib < nb; ib++) {
      const id = ia * nb + ib;
      keys[id] = inputs[ia].area + loads[ib].area;
      words[2 * id + low] = id;
    }
  }
  keys.sort();
  const order = new Uint32Array(keys.length);
  for (let k = 0; k < order.length; k++) order[k] = words[2 * k + low];
  return order;
}

// Indices of the `k` largest values (ties: lower index first).
function topIndices(values: ArrayLike<number>, k: number): number[] {
  const idx = Array.from({ length: values.length }, (_, i) => i);
  return idx.sort((x, y) => values[y] - values[x] || x - y).slice(0, k);
}

/** How many of the sides with the best bounds seed the pools, each way (input × load pairs). */
const SEEDS = 5;

/**
 * The pair screen's state: the sides' curves side by side in flat arrays
 * (row k: side k's n grid points), their bounds, and the pools. `rate` screens
 * one pair; it builds no objects.
 */
class PairScreen {
  readonly n: number;
  readonly nb: number;
  readonly m: number;
  readonly target: number;
  readonly swingTarget: number;
  readonly byArea: boolean;
  readonly gm: Float64Array;
  readonly rin: Float64Array;
  readonly rload: Float64Array;
  readonly area: Float64Array;
  readonly areaLoad: Float64Array;
  readonly cddIn: Float64Array;
  readonly cddLoad: Float64Array;
  readonly swIn: Float64Array;
  readonly heldIn: Float64Array;
  readonly swLoad: Float64Array;
  readonly vlowIn: Float64Array;
  readonly vhighIn: Float64Array;
  readonly vlowLoad: Float64Array;
  readonly vhighLoad: Float64Array;
  readonly heldLoad: Float64Array;
  readonly loIn: Int32Array;
  readonly hiIn: Int32Array;
  readonly loLoad: Int32Array;
  readonly hiLoad: Int32Array;
  readonly gains: Float64Array;
  readonly left: Float64Array;
  readonly right: Float64Array;
  readonly core0: number;
  readonly core1: number;
  readonly obj = new TopK<number>(7);
  readonly swing = new TopK<number>(3);
  readonly hold = new TopK<number>(2);
  readonly short = new TopK<number>(2);
  /** Pairs whose swing was found by tracing the curve out from the design point, and whose whole curve was traced. */
  traced = 0;
  whole = 0;

  constructor(readonly stage: StageSpec, inputs: readonly SideDesign[], loads: readonly SideDesign[], readonly vs: Float64Array, readonly j0: number) {
    const n = vs.length;
    this.n = n;
    this.nb = loads.length;
    const step = n > 1 ? vs[1] - vs[0] : 1;
    this.m = Math.ceil(stage.swing / step - 1e-9);
    this.target = stage.gain;
    this.swingTarget = stage.swing;
    this.byArea = stage.objective === 'area';
    this.gains = new Float64Array(n);
    this.left = new Float64Array(n);
    this.right = new Float64Array(n);
    let gmMax = 0;
    for (const a of inputs) for (const g of a.gm as Float64Array) if (g > gmMax) gmMax = g;
    const ib = inputBounds(stage, inputs, vs, j0, this.m, this.left, this.right);
    const lb = loadBounds(stage, loads, gmMax, vs, j0, this.m, this.left, this.right);
    this.swIn = Float64Array.from(ib, (b) => b.swing);
    this.heldIn = Float64Array.from(ib, (b) => b.held);
    this.swLoad = Float64Array.from(lb, (b) => b.swing);
    this.vlowIn = Float64Array.from(ib, (b) => b.vlow);
    this.vhighIn = Float64Array.from(ib, (b) => b.vhigh);
    this.vlowLoad = Float64Array.from(lb, (b) => b.vlow);
    this.vhighLoad = Float64Array.from(lb, (b) => b.vhigh);
    this.heldLoad = Float64Array.from(lb, (b) => b.held);
    this.loIn = Int32Array.from(ib, (b) => b.lo);
    this.hiIn = Int32Array.from(ib, (b) => b.hi);
    this.loLoad = Int32Array.from(lb, (b) => b.lo);
    this.hiLoad = Int32Array.from(lb, (b) => b.hi);
    this.gm = new Float64Array(inputs.length * n);
    this.rin = new Float64Array(inputs.length * n);
    this.rload = new Float64Array(loads.length * n);
    inputs.forEach((a, k) => {
      this.gm.set(a.gm as Float64Array, k * n);
      this.rin.set(a.rout, k * n);
    });
    loads.forEach((b, k) => this.rload.set(b.rout, k * n));
    this.area = Float64Array.from(inputs, (a) => a.area);
    this.areaLoad = Float64Array.from(loads, (b) => b.area);
    this.cddIn = Float64Array.from(inputs, (a) => a.cdd);
    this.cddLoad = Float64Array.from(loads, (b) => b.cdd);
    this.core0 = Math.min(j0, n - 1 - this.m);
    this.core1 = Math.max(0, j0 - this.m) + this.m;
  }

  /** Upper bound on the swing of pair (ia, ib) from the two sides' swing edges (the input side usually bounds vlow, the load vhigh). */
  swingBound(ia: number, ib: number): number {
    return Math.min(this.vhighIn[ia], this.vhighLoad[ib]) - Math.max(this.vlowIn[ia], this.vlowLoad[ib]) + SLACK;
  }

  private gainAt(oa: number, ob: number, j: number): number {
    return gainOf(this.gm[oa + j], this.rin[oa + j], this.rload[ob + j]);
  }

  /**
   * Highest swing pair (ia, ib) can have, from its gain near the crossings.
   * Low side: from the lowest grid point where both sides' own curves meet
   * the target (just below it the pair misses), inwards while the pair misses
   * too, to the first point where it meets the target: vlow lies at or above
   * the crossing between that point and the one below (swingOnGrid's own
   * interpolation; a miss nearer the design point only raises vlow). The high
   * side likewise. Exact for a curve that crosses the target once each way,
   * and it reads only the points near the crossings.
   */
  private probedSwing(ia: number, ib: number, need: number): number {
    const { vs, j0, n, target } = this;
    const oa = ia * n;
    const ob = ib * n;
    if (!(this.gainAt(oa, ob, j0) >= target)) return 0;
    const lo0 = Math.max(this.loIn[ia], this.loLoad[ib]);
    const hi0 = Math.min(this.hiIn[ia], this.hiLoad[ib]);
    if (lo0 > j0 || hi0 < j0) return Infinity; // cannot be (the pair meets the target at the design point): no bound
    let e = lo0;
    let g = lo0 > 0 ? this.gainAt(oa, ob, lo0 - 1) : 0;
    let ge = this.gainAt(oa, ob, e);
    while (e < j0 && !(ge >= target)) {
      g = ge;
      ge = this.gainAt(oa, ob, ++e);
    }
    const lo = e > 0 ? crossing(vs[e], ge, vs[e - 1], g, target) : vs[0];
    // vhigh lies at or below the grid point above the high side's bound.
    if (vs[Math.min(hi0 + 1, n - 1)] - lo < need) return vs[Math.min(hi0 + 1, n - 1)] - lo;
    e = hi0;
    g = hi0 < n - 1 ? this.gainAt(oa, ob, hi0 + 1) : 0;
    ge = this.gainAt(oa, ob, e);
    while (e > j0 && !(ge >= target)) {
      g = ge;
      ge = this.gainAt(oa, ob, --e);
    }
    const hi = e < n - 1 ? crossing(vs[e], ge, vs[e + 1], g, target) : vs[n - 1];
    return hi - lo;
  }

  /** Screen pair (ia, ib): skipped when its bounds show it cannot enter any pool. */
  rate(ia: number, ib: number): void {
    const { n, j0, target, swingTarget, stage, gains, obj, swing, hold, short } = this;
    const oa = ia * n;
    const ob = ib * n;
    const id = ia * this.nb + ib;
    const area = this.area[ia] + this.areaLoad[ib];
    // Area breaks ties within each measure: 1e6 per m² is 0.1 mV of swing per 100 µm².
    const tie = area * 1e6;
    let gbwShort = 0;
    if (stage.gbw !== undefined) {
      const c = (stage.cap ?? 0) + (this.cddIn[ia] > 0 ? this.cddIn[ia] : 0) + (this.cddLoad[ib] > 0 ? this.cddLoad[ib] : 0);
      gbwShort = Math.max(0, Math.log(stage.gbw / (this.gm[oa + j0] / (2 * Math.PI * c))));
    }
    let swU = this.swingBound(ia, ib);
    let heldU = Math.min(this.heldIn[ia], this.heldLoad[ib]);
    // Every window holds the grid points [core0, core1]: the held gain is at most the gain at either end
    // (read only when the sides' bound leaves the held or the shortfall pool open).
    if (could(hold, -Math.log(Math.max(heldU, 1e-30)) + tie) || could(short, Math.max(0, Math.log(target / Math.max(heldU, 1e-30))) + gbwShort + tie)) {
      heldU = Math.min(heldU, this.gainAt(oa, ob, this.core0), this.gainAt(oa, ob, this.core1));
    }
    // Lowest keys the pair could have (the shortfall key also gains the swing shortfall, below).
    // With objective area the key is the area itself: no slack needed.
    const objOpen = gbwShort === 0 && (!this.byArea || obj.accepts(area));
    const holdOpen = could(hold, -Math.log(Math.max(heldU, 1e-30)) + tie);
    const shortLow = Math.max(0, Math.log(target / Math.max(heldU, 1e-30))) + gbwShort + tie;
    // The swing each pool needs (a pair below every need and outside the held pool is skipped).
    const needObj = objOpen ? swingTarget - SLACK : Infinity;
    const needSwing = swingNeed(swing, tie);
    const shortRoom = short.worst() === undefined ? Infinity : short.worst()! + SLACK - shortLow;
    const needShort = shortRoom === Infinity ? -Infinity : shortRoom > 0 ? swingTarget - swingTarget * shortRoom : Infinity;
    if (!holdOpen) {
      const need = Math.min(needObj, needSwing, needShort);
      if (!(swU >= need)) return;
      if (need > 0) swU = Math.min(swU, this.probedSwing(ia, ib, need));
      if (!(swU >= need)) return;
    }
    this.traced++;
    // The exact swing needs the curve only out to the first point below the gain target either way.
    const g0 = (gains[j0] = this.gainAt(oa, ob, j0));
    if (g0 >= target) {
      for (let j = j0 - 1; j >= 0 && (gains[j] = this.gainAt(oa, ob, j)) >= target; j--);
      for (let j = j0 + 1; j < n && (gains[j] = this.gainAt(oa, ob, j)) >= target; j++);
    }
    const sw = swingAtGain(this.vs, gains, j0, target);
    if (sw >= swingTarget && gbwShort === 0) {
      const key = this.byArea ? area : stage.objective === 'swing' ? -sw + tie : -Math.log(g0) + tie;
      if (obj.accepts(key)) obj.push(key, id);
    }
    if (swing.accepts(-sw + tie)) swing.push(-sw + tie, id);
    // The gain held over the swing target needs the whole curve: only when it could still count.
    if (!holdOpen && !could(short, shortLow + Math.max(0, swingTarget - sw) / swingTarget)) return;
    this.whole++;
    for (let j = 0; j < n; j++) gains[j] = this.gainAt(oa, ob, j);
    const held = gainOverWindow(gains, j0, this.m, this.left, this.right);
    const h = -Math.log(Math.max(held, 1e-30)) + tie;
    if (hold.accepts(h)) hold.push(h, id);
    const s = Math.max(0, Math.log(target / Math.max(held, 1e-30))) + Math.max(0, swingTarget - sw) / swingTarget + gbwShort + tie;
    if (short.accepts(s)) short.push(s, id);
  }
}

/** Side indices by a bound, highest first (ties: lower index first). */
function byBound(values: Float64Array): number[] {
  return Array.from({ length: values.length }, (_, i) => i).sort((x, y) => values[y] - values[x] || x - y);
}

/**
 * Screen every (input, load) pair with the gain curve estimated from the two
 * sides' curves on the output grid, A ≈ gm_in·(Rout_in ∥ Rout_load) with the
 * input side at the design current. Keeps, by several measures, the pairs worth
 * an exact trace: by the objective among those meeting the targets by
 * estimate, by swing at the gain target, by gain held over the swing target,
 * and by total shortfall (so infeasible stages still get near points).
 *
 * Each pool keeps the pairs with the smallest keys whatever order the pairs
 * come in, so pairs are rated where each pool can still take them, and a
 * pair no pool can take is not rated at all: first the pairs of the sides
 * with the best swing and held-gain bounds (good keys early), then in order
 * of area while the pool of area keys (objective area) or the shortfall pool
 * (key ≥ its area term) could take them, then per input the loads whose own
 * bound still lets the pair into the swing pool, then likewise for the held
 * gain pool. A pair no pool can take never has a key below the worst kept one
 * at the end, and every pool's worst key only falls, so no pair that one would
 * keep is passed over. `rate` itself skips a pair whose bounds (each side
 * alone, the gain near the crossings) show it cannot enter any pool.
 */
export function screenPairs(stage: StageSpec, inputs: readonly SideDesign[], loads: readonly SideDesign[], vs: Float64Array, j0: number): { pairs: Pair[]; screened: number; rated: number; traced: number } {
  const nb = loads.length;
  const screen = new PairScreen(stage, inputs, loads, vs, j0);
  const done = new Uint8Array(inputs.length * nb);
  let rated = 0;
  const rate = (ia: number, ib: number): void => {
    if (done[ia * nb + ib]) return;
    done[ia * nb + ib] = 1;
    rated++;
    screen.rate(ia, ib);
  };
  const seed = (ins: number[], lds: number[]): void => {
    for (const ia of ins) for (const ib of lds) rate(ia, ib);
  };
  seed(topIndices(screen.swIn, SEEDS), topIndices(screen.swLoad, SEEDS));
  seed(topIndices(screen.heldIn, SEEDS), topIndices(screen.heldLoad, SEEDS));
  const { obj, swing, hold, short } = screen;
  const byArea = stage.objective === 'area';
  // Area order: with another objective every pair (the objective's key is not bounded here).
  for (const id of areaOrder(inputs, loads)) {
    const ia = Math.floor(id / nb);
    const ib = id % nb;
    const area = screen.area[ia] + screen.areaLoad[ib];
    const objShut = byArea && !obj.accepts(area);
    const shortShut = !could(short, area * 1e6);
    if (objShut && shortShut) break;
    rate(ia, ib);
  }
  let minLoad = Infinity;
  for (const x of screen.areaLoad) minLoad = Math.min(minLoad, x);
  const swIns = byBound(screen.swIn);
  const swLoads = byBound(screen.swLoad);
  for (const ia of swIns) {
    const tie = (screen.area[ia] + minLoad) * 1e6;
    if (!(screen.swIn[ia] >= swingNeed(swing, tie))) continue;
    for (const ib of swLoads) {
      const need = swingNeed(swing, tie);
      if (!(screen.swLoad[ib] >= need)) break;
      if (screen.swingBound(ia, ib) >= need) rate(ia, ib);
    }
  }
  const heldIns = byBound(screen.heldIn);
  const heldLoads = byBound(screen.heldLoad);
  for (const ia of heldIns) {
    const tie = (screen.area[ia] + minLoad) * 1e6;
    if (!could(hold, -Math.log(Math.max(screen.heldIn[ia], 1e-30)) + tie)) continue;
    for (const ib of heldLoads) {
      if (!could(hold, -Math.log(Math.max(screen.heldLoad[ib], 1e-30)) + tie)) break;
      rate(ia, ib);
    }
  }
  const out: Pair[] = [];
  const kept = new Set<number>();
  for (const pool of [obj, swing, hold, short]) {
    for (const id of pool.sorted()) {
      if (kept.has(id)) continue;
      kept.add(id);
      out.push({ input: inputs[Math.floor(id / nb)], load: loads[id % nb] });
    }
  }
  return { pairs: out, screened: inputs.length * nb, rated, traced: screen.traced };
}
