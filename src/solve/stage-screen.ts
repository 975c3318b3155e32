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

/**
 * Screen every (input, load) pair with the gain curve estimated from the two
 * sides' curves on the output grid, A ≈ gm_in·(Rout_in ∥ Rout_load) with the
 * input side at the design current. Keeps, by several measures, the pairs worth
 * an exact trace: by the objective among those meeting the targets by
 * estimate, by swing at the gain target, by gain held over the swing target,
 * and by total shortfall (so infeasible stages still get near points).
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
  let screened = 0;
  for (const a of inputs) {
    const gm = a.gm as Float64Array;
    for (const b of loads) {
      screened++;
      for (let j = 0; j < n; j++) {
        const r1 = a.rout[j];
        const r2 = b.rout[j];
        gains[j] = gm[j] > 0 && r1 > 0 && r2 > 0 ? gm[j] * parallel(r1, r2) : 0;
      }
      const sw = swingAtGain(vs, gains, j0, stage.gain);
      const held = gainOverWindow(gains, j0, m, left, right);
      let gbwShort = 0;
      if (stage.gbw !== undefined) {
        const c = (stage.cap ?? 0) + (a.cdd > 0 ? a.cdd : 0) + (b.cdd > 0 ? b.cdd : 0);
        gbwShort = Math.max(0, Math.log(stage.gbw / (gm[j0] / (2 * Math.PI * c))));
      }
      const area = a.area + b.area;
      // Area breaks ties within each measure: 1e6 per m² is 0.1 mV of swing per 100 µm².
      const tie = area * 1e6;
      const pair = (): Pair => ({ input: a, load: b });
      if (sw >= stage.swing && gbwShort === 0) {
        const key = stage.objective === 'area' ? area : stage.objective === 'swing' ? -sw + tie : -Math.log(gains[j0]) + tie;
        if (obj.accepts(key)) obj.push(key, pair());
      }
      if (swing.accepts(-sw + tie)) swing.push(-sw + tie, pair());
      const h = -Math.log(Math.max(held, 1e-30)) + tie;
      if (hold.accepts(h)) hold.push(h, pair());
      const s = Math.max(0, Math.log(stage.gain / Math.max(held, 1e-30))) + Math.max(0, stage.swing - sw) / stage.swing + gbwShort + tie;
      if (short.accepts(s)) short.push(s, pair());
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
