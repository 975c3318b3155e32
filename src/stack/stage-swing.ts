/**
 * Output swing and the gain held over a swing, from a sampled gain curve.
 * `vs` ascending output voltages (V), `gains` the gain there (0 where the
 * circuit cannot hold the output), linear between samples.
 */
import { REL_TOL } from '../policy.js';

/** Index of the sample at `output` (the design point is a grid point). */
export function indexOf(vs: ArrayLike<number>, output: number): number {
  let best = 0;
  for (let j = 1; j < vs.length; j++) if (Math.abs(vs[j] - output) < Math.abs(vs[best] - output)) best = j;
  return best;
}

/** Where the linear segment from (v0, g0) (≥ target) to (v1, g1) (< target) crosses the target. */
export function crossing(v0: number, g0: number, v1: number, g1: number, target: number): number {
  const t = g0 > g1 ? (g0 - target) / (g0 - g1) : 0;
  return v0 + Math.min(Math.max(t, 0), 1) * (v1 - v0);
}

/**
 * The grid samples next to the design point (sample `j0`) that hold the gain target: from `lo` to `hi`, the
 * neighbours of j0 outwards while gain ≥ target (j0 itself is not tested).
 */
export function holdingRun(gains: ArrayLike<number>, j0: number, target: number): { lo: number; hi: number } {
  let lo = j0;
  while (lo > 0 && gains[lo - 1] >= target) lo--;
  let hi = j0;
  while (hi < gains.length - 1 && gains[hi + 1] >= target) hi++;
  return { lo, hi };
}

/**
 * Widest interval [vlow, vhigh] containing the design point (sample `j0`) on
 * which gain ≥ target, crossings by linear interpolation; null when the gain
 * at the design point is below target.
 */
export function swingOnGrid(vs: ArrayLike<number>, gains: ArrayLike<number>, j0: number, target: number): { vlow: number; vhigh: number } | null {
  if (!(gains[j0] >= target)) return null;
  const { lo: a, hi: b } = holdingRun(gains, j0, target);
  const vlow = a > 0 ? crossing(vs[a], gains[a], vs[a - 1], gains[a - 1], target) : vs[a];
  const vhigh = b < vs.length - 1 ? crossing(vs[b], gains[b], vs[b + 1], gains[b + 1], target) : vs[b];
  return { vlow, vhigh };
}

function interp(vs: ArrayLike<number>, gains: ArrayLike<number>, v: number): number {
  let k = 0;
  while (k < vs.length - 2 && vs[k + 1] < v) k++;
  const t = (v - vs[k]) / (vs[k + 1] - vs[k]);
  return gains[k] + Math.min(Math.max(t, 0), 1) * (gains[k + 1] - gains[k]);
}

/**
 * Best gain a design holds over a swing of `width`: the highest, over output
 * intervals [a, a + width] that contain the design point and lie in the
 * sampled range, of the lowest gain on the interval. Intervals with one end on
 * a sample are tried (the optimum of a piecewise-linear minimum lies there or
 * where the two ends are equal, which the neighbouring trials bracket closely).
 * 0 when no interval fits.
 */
export function gainOverSwing(vs: ArrayLike<number>, gains: ArrayLike<number>, j0: number, width: number): number {
  const n = vs.length;
  const lo = vs[0];
  const hi = vs[n - 1];
  const output = vs[j0];
  let best = 0;
  const tryWindow = (a: number): void => {
    const b = a + width;
    if (a < lo - 1e-12 || b > hi + 1e-12 || a > output + 1e-12 || b < output - 1e-12) return;
    let m = Math.min(interp(vs, gains, a), interp(vs, gains, b));
    for (let j = 0; j < n && m > best; j++) if (vs[j] > a && vs[j] < b) m = Math.min(m, gains[j]);
    if (m > best) best = m;
  };
  for (let j = 0; j < n; j++) {
    tryWindow(vs[j]);
    tryWindow(vs[j] - width);
  }
  return best;
}

/**
 * gainOverSwing of a traced curve with its swing edges as two more samples: there the gain equals `target` (the
 * edges are solved on the circuit), which the grid's samples either side of an edge, linear between them, read
 * far lower where the gain falls steeply. So a design whose swing reaches `width` holds at least `target` over it,
 * as the definitions say it must.
 */
export function gainOverSwingWithEdges(
  vs: ArrayLike<number>, gains: ArrayLike<number>, j0: number, width: number, edges: { vlow: number | null; vhigh: number | null }, target: number,
): number {
  const xs: number[] = [];
  const gs: number[] = [];
  let k0 = 0;
  const push = (v: number, g: number): void => {
    if (xs.length > 0 && !(v > xs[xs.length - 1])) return;
    xs.push(v);
    gs.push(g);
  };
  const isEdge = (v: number): boolean => v === edges.vlow || v === edges.vhigh;
  for (let j = 0; j < vs.length; j++) {
    if (edges.vlow !== null && edges.vlow > (j > 0 ? vs[j - 1] : -Infinity) && edges.vlow < vs[j]) push(edges.vlow, target);
    if (edges.vhigh !== null && edges.vhigh > (j > 0 ? vs[j - 1] : -Infinity) && edges.vhigh < vs[j]) push(edges.vhigh, target);
    if (j === j0) k0 = xs.length;
    // An edge bisected onto a sample (within its resolution) holds the target there, not the sample's higher gain,
    // or the segment beyond it would read a window poking past the edge as holding the target.
    push(vs[j], isEdge(vs[j]) ? Math.min(gains[j], target) : gains[j]);
  }
  // A swing reaching `width` within the targets' tolerance (REL_TOL, as meets in solve/stage-rank.ts) holds the
  // target over it: edges 1 V apart on the 0.5 mV bisection grid differ by 0.9999999999999999 V in floating point,
  // and a window of exactly `width` would poke past an edge by that rounding and read a hair below the target.
  return gainOverSwing(xs, gs, k0, width * (1 - REL_TOL));
}

/** Widest swing with gain ≥ target around the design point, V (0 when the design point misses the target). */
export function swingAtGain(vs: ArrayLike<number>, gains: ArrayLike<number>, j0: number, target: number): number {
  // swingOnGrid's arithmetic without its object: this runs for every pair a stage screen rates.
  if (!(gains[j0] >= target)) return 0;
  const n = vs.length;
  let a = j0;
  while (a > 0 && gains[a - 1] >= target) a--;
  let b = j0;
  while (b < n - 1 && gains[b + 1] >= target) b++;
  const vlow = a > 0 ? crossing(vs[a], gains[a], vs[a - 1], gains[a - 1], target) : vs[a];
  const vhigh = b < n - 1 ? crossing(vs[b], gains[b], vs[b + 1], gains[b + 1], target) : vs[b];
  return vhigh - vlow;
}

/** Output grid through the design point: output + k·step inside (0, supply). */
export function outputGrid(output: number, supply: number, step: number): Float64Array {
  const below = Math.floor((output - 1e-9) / step);
  const above = Math.floor((supply - output - 1e-9) / step);
  const out = new Float64Array(below + above + 1);
  for (let k = -below; k <= above; k++) out[k + below] = output + k * step;
  return out;
}
