import type { StackOp } from './types.js';
import { sampleOf, stagePoint, stageSample, type StageCircuit, type StagePoint, type StageSample } from './stage-point.js';
import { swingEdge } from './stage-edge.js';
import { holdingRun, indexOf, outputGrid } from './stage-swing.js';

/** Finest resolution a swing edge is refined to near the swing target, V. */
const FINEST_EDGE = 1e-8;
/** How far below its target a swing still meets it, V: the allowance for rounding of every check of a swing against its target. */
export const SWING_TOLERANCE = 1e-9;

/** A stage's transfer curve on an output grid through the design point, with its swing. */
export interface StageTrace {
  /** Output voltages of the grid, ascending, V. */
  vs: Float64Array;
  /** Gain at each grid output (0 where the circuit cannot hold it within the table). */
  gains: Float64Array;
  /** Solved points (null where not coverable), same indices; a trace with `keep` 'design' holds only the design point's. */
  points: Array<StagePoint | null>;
  /** The solved points as starts for solves nearby (heldGain), same indices; a search trace kept by the stage search holds only the design point's and those just inside the swing edges (stage-eval stageAt). */
  samples: Array<StageSample | null>;
  /** Index of the design point. */
  j0: number;
  /** Swing edges refined by bisection on the circuit, V; null when the design point misses the gain target. */
  vlow: number | null;
  vhigh: number | null;
  swing: number;
}

/**
 * Trace the transfer curve outwards from the design point on a grid of `step`
 * (continuation: each DC solve starts from its neighbour), then refine each
 * swing edge on the circuit to `resolution` (the answer bisection gives, see swingEdge). A swing edge at the
 * end of the grid stays there (the circuit holds the gain up to the last point). `keep` 'design': of the solved
 * points only the design point's is built whole (the others' gains and samples are the same).
 */
export function traceStage(c: StageCircuit, output: number, target: number, opts: { step: number; resolution?: number; keep?: 'all' | 'design'; swing?: number }): StageTrace {
  const vs = outputGrid(output, c.supply, opts.step);
  const j0 = indexOf(vs, output);
  const points: Array<StagePoint | null> = new Array(vs.length).fill(null);
  const samples: Array<StageSample | null> = new Array(vs.length).fill(null);
  const gains = new Float64Array(vs.length);
  const whole = opts.keep !== 'design';
  // Each solve starts from the last solved neighbour towards the design point.
  let near: StageSample | null = null;
  const at = (j: number, guess: StackOp | undefined): StackOp | undefined => {
    let s: StageSample | null;
    if (whole || j === j0) {
      const p = stagePoint(c, vs[j], guess, near ?? undefined);
      points[j] = p;
      s = p && sampleOf(p);
    } else {
      s = stageSample(c, vs[j], guess, near ?? undefined);
    }
    samples[j] = s;
    gains[j] = s ? s.gain : 0;
    if (s) near = s;
    return s?.load ?? guess;
  };
  const mid = at(j0, undefined);
  let g = mid;
  for (let j = j0 + 1; j < vs.length; j++) g = at(j, g);
  g = mid;
  near = samples[j0];
  for (let j = j0 - 1; j >= 0; j--) g = at(j, g);
  // No swing where the design point misses the target (as swingOnGrid).
  if (!(gains[j0] >= target)) return { vs, gains, points, samples, j0, vlow: null, vhigh: null, swing: 0 };
  const solve = (v: number, near: StageSample | null): StageSample | null => stageSample(c, v, near?.load, near ?? undefined);
  const { lo, hi } = holdingRun(gains, j0, target);
  const edges = (res: number): { vlow: number; vhigh: number; swing: number } => {
    const edge = (inside: number, outside: number): number => swingEdge(solve, vs[inside], vs[outside], gains[inside], gains[outside], target, res, samples[inside]);
    const vlow = lo > 0 ? edge(lo, lo - 1) : vs[lo];
    const vhigh = hi < vs.length - 1 ? edge(hi, hi + 1) : vs[hi];
    // The edges lie on a sub-mV bisection of decimal grid voltages: their difference is cleared of binary rounding
    // (1.5075 − 0.2875 = 1.2199999999999998), so a swing that meets its target reads so wherever it is shown.
    return { vlow, vhigh, swing: Math.round((vhigh - vlow) * 1e12) / 1e12 };
  };
  let res = opts.resolution ?? 5e-4;
  let e = edges(res);
  // Each bisected edge lies up to `res` inside the true one: a swing that much short of its target may yet meet it,
  // as the gain held over the target's width (heldGain, its window ends solved) then shows; so the edges are refined
  // until the verdict is decided.
  const slack = (lo > 0 ? 1 : 0) + (hi < vs.length - 1 ? 1 : 0);
  const wanted = opts.swing;
  while (wanted !== undefined && e.swing < wanted - SWING_TOLERANCE && e.swing + slack * res >= wanted && res > FINEST_EDGE) {
    res /= 16;
    e = edges(res);
  }
  return { vs, gains, points, samples, j0, ...e };
}

/**
 * Best gain held over a swing of `width` around the design point, with the
 * interval ends solved on the circuit: with a single-peaked gain curve the best
 * interval [a, a + width] has equal gain at both ends, so a is bisected on
 * A(a) − A(a + width); samples inside the interval can only lower the result.
 * 0 when no interval of that width fits between the rails.
 */
export function heldGain(c: StageCircuit, trace: StageTrace, width: number, resolution = 1e-4): number {
  const { vs, gains, j0, vlow, vhigh } = trace;
  const output = vs[j0];
  let lo = Math.max(vs[0], output - width);
  let hi = Math.min(output, vs[vs.length - 1] - width);
  // A swing covering the width holds the best window (an end past a swing edge reads below the target): its ends
  // stay between the solved edges, where a window as wide as the swing itself ends on both, at the gain target.
  if (vlow !== null && vhigh !== null && trace.swing >= width - SWING_TOLERANCE) {
    lo = Math.max(lo, vlow);
    hi = Math.max(lo, Math.min(hi, vhigh - width));
  }
  if (!(hi >= lo)) return 0;
  const gainAt = (v: number): number => {
    const q = nearestSample(trace, v);
    const p = stageSample(c, v, q?.load, q);
    return p ? p.gain : 0;
  };
  let a = lo;
  if (hi > lo) {
    while (hi - lo > resolution) {
      const m = 0.5 * (lo + hi);
      if (gainAt(m) < gainAt(m + width)) lo = m;
      else hi = m;
    }
    a = 0.5 * (lo + hi);
  }
  let held = Math.min(gainAt(a), gainAt(a + width));
  for (let j = 0; j < vs.length; j++) if (vs[j] > a && vs[j] < a + width) held = Math.min(held, gains[j]);
  return held;
}

/** The solved grid sample nearest to v, as a starting guess (undefined when none is kept). */
export function nearestSample(trace: StageTrace, v: number): StageSample | undefined {
  let best: StageSample | undefined;
  let dist = Infinity;
  trace.samples.forEach((p, j) => {
    const d = Math.abs(trace.vs[j] - v);
    if (p && d < dist) {
      dist = d;
      best = p;
    }
  });
  return best;
}
