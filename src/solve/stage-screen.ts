import type { StageSpec } from '../design/types.js';
import { parallel, swingAtGain } from '../stack/index.js';
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
 * Both measures only grow when the curve rises pointwise.
 */
interface Bound {
  swing: number;
  held: number;
}

function boundOf(stage: StageSpec, curve: Float64Array, vs: Float64Array, j0: number, m: number, left: Float64Array, right: Float64Array): Bound {
  return {
    swing: swingAtGain(vs, curve, j0, stage.gain) + SLACK,
    held: gainOverWindow(curve, j0, m, left, right) * (1 + SLACK),
  };
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

// Estimated gain of a pair at grid point j: gm_in·(Rout_in ∥ Rout_load), 0 where a side is not coverable.
function gainAt(a: SideDesign, b: SideDesign, j: number): number {
  const g = (a.gm as Float64Array)[j];
  const r1 = a.rout[j];
  const r2 = b.rout[j];
  return g > 0 && r1 > 0 && r2 > 0 ? g * parallel(r1, r2) : 0;
}

// True when a key of at least `lower` could still enter the pool (it keeps the k smallest, first come on ties).
function could(pool: TopK<Pair>, lower: number): boolean {
  const worst = pool.worst();
  return worst === undefined || !(lower - SLACK >= worst);
}

/**
 * Screen every (input, load) pair with the gain curve estimated from the two
 * sides' curves on the output grid, A ≈ gm_in·(Rout_in ∥ Rout_load) with the
 * input side at the design current. Keeps, by several measures, the pairs worth
 * an exact trace: by the objective among those meeting the targets by
 * estimate, by swing at the gain target, by gain held over the swing target,
 * and by total shortfall (so infeasible stages still get near points).
 * A pair whose bounds from each side alone show it cannot enter any pool is
 * skipped without tracing its curve (the pools keep the same pairs).
 */
export function screenPairs(stage: StageSpec, inputs: readonly SideDesign[], loads: readonly SideDesign[], vs: Float64Array, j0: number): { pairs: Pair[]; screened: number } {
  const n = vs.length;
  const step = n > 1 ? vs[1] - vs[0] : 1;
  const m = Math.ceil(stage.swing / step - 1e-9);
  const gains = new Float64Array(n);
  const left = new Float64Array(n);
  const right = new Float64Array(n);
  const obj = new TopK<Pair>(7);
  const swing = new TopK<Pair>(3);
  const hold = new TopK<Pair>(2);
  const short = new TopK<Pair>(2);
  let gmMax = 0;
  for (const a of inputs) for (const g of a.gm as Float64Array) if (g > gmMax) gmMax = g;
  const ib = inputBounds(stage, inputs, vs, j0, m, left, right);
  const lb = loadBounds(stage, loads, gmMax, vs, j0, m, left, right);
  const core0 = Math.min(j0, n - 1 - m);
  const core1 = Math.max(0, j0 - m) + m;
  let screened = 0;
  for (let ia = 0; ia < inputs.length; ia++) {
    const a = inputs[ia];
    const gm = a.gm as Float64Array;
    for (let ib2 = 0; ib2 < loads.length; ib2++) {
      const b = loads[ib2];
      screened++;
      const area = a.area + b.area;
      // Area breaks ties within each measure: 1e6 per m² is 0.1 mV of swing per 100 µm².
      const tie = area * 1e6;
      let gbwShort = 0;
      if (stage.gbw !== undefined) {
        const c = (stage.cap ?? 0) + (a.cdd > 0 ? a.cdd : 0) + (b.cdd > 0 ? b.cdd : 0);
        gbwShort = Math.max(0, Math.log(stage.gbw / (gm[j0] / (2 * Math.PI * c))));
      }
      const swU = Math.min(ib[ia].swing, lb[ib2].swing);
      // Every window holds the grid points [core0, core1]: the held gain is at most the gain at either end.
      const heldU = Math.min(ib[ia].held, lb[ib2].held, gainAt(a, b, core0), gainAt(a, b, core1));
      // Lowest keys the pair could have (the shortfall key also gains the swing shortfall, below).
      const objOpen = gbwShort === 0 && (stage.objective !== 'area' || could(obj, area));
      const holdOpen = could(hold, -Math.log(Math.max(heldU, 1e-30)) + tie);
      const shortLow = Math.max(0, Math.log(stage.gain / Math.max(heldU, 1e-30))) + gbwShort + tie;
      if (!(objOpen && swU >= stage.swing - SLACK) && !could(swing, -swU + tie) && !holdOpen
        && !could(short, shortLow + Math.max(0, stage.swing - swU) / stage.swing)) continue;
      // The exact swing needs the curve only out to the first point below the gain target either way.
      gains[j0] = gainAt(a, b, j0);
      if (gains[j0] >= stage.gain) {
        for (let j = j0 - 1; j >= 0 && (gains[j] = gainAt(a, b, j)) >= stage.gain; j--);
        for (let j = j0 + 1; j < n && (gains[j] = gainAt(a, b, j)) >= stage.gain; j++);
      }
      const sw = swingAtGain(vs, gains, j0, stage.gain);
      if (sw >= stage.swing && gbwShort === 0) {
        const key = stage.objective === 'area' ? area : stage.objective === 'swing' ? -sw + tie : -Math.log(gains[j0]) + tie;
        if (obj.accepts(key)) obj.push(key, { input: a, load: b });
      }
      if (swing.accepts(-sw + tie)) swing.push(-sw + tie, { input: a, load: b });
      // The gain held over the swing target needs the whole curve: only when it could still count.
      if (!holdOpen && !could(short, shortLow + Math.max(0, stage.swing - sw) / stage.swing)) continue;
      for (let j = 0; j < n; j++) gains[j] = gainAt(a, b, j);
      const held = gainOverWindow(gains, j0, m, left, right);
      const h = -Math.log(Math.max(held, 1e-30)) + tie;
      if (hold.accepts(h)) hold.push(h, { input: a, load: b });
      const s = Math.max(0, Math.log(stage.gain / Math.max(held, 1e-30))) + Math.max(0, stage.swing - sw) / stage.swing + gbwShort + tie;
      if (short.accepts(s)) short.push(s, { input: a, load: b });
    }
  }
  const out: Pair[] = [];
  const keyOf = (p: Pair) => `${inputs.indexOf(p.input)}|${loads.indexOf(p.load)}`;
  const keys = new Set<string>();
  for (const pool of [obj, swing, hold, short]) {
    for (const p of pool.sorted()) {
      const k = keyOf(p);
      if (keys.has(k)) continue;
      keys.add(k);
      out.push(p);
    }
  }
  return { pairs: out, screened };
}
