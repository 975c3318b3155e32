import type { StackDevice } from './types.js';
import { covers } from './range.js';

const MAX_ITER = 40;
// A step limit keeps Newton from leaping across the saturation knee, where gds is tiny.
const MAX_STEP = 0.1;

/**
 * Newton on KCL of the series chain: unknowns x_1..x_{N−1} and I, residuals
 * r_k = W_k·jd_k(g_k − x_{k−1}, x_k − x_{k−1}, x_{k−1}) − I. Returns the current, NaN when it leaves the table or
 * does not converge (the caller falls back); the nodes and each device's current and small-signal values are left in
 * the solution of the chain length (solutionOf), valid until the next solve, so nothing is built here. The start
 * is the first `count` nodes written into newtonStart(n) (missing ones spread evenly). Allocates nothing once warm.
 */
export function newtonSolve(devices: readonly StackDevice[], gates: readonly number[], v: number, i0: number, count: number): number {
  const n = devices.length;
  const w = scratchFor(n);
  const { r, dx, x } = w;
  x[0] = 0;
  x[n] = v;
  for (let k = 1; k < n; k++) {
    // The even spread and the given node are both read on every call: code never run before optimisation deopts.
    const spread = (v * k) / n;
    const given = x[k];
    x[k] = Math.min(Math.max(k < count ? given : spread, x[k - 1]), v);
  }
  let i = i0;
  // Without a start current, the bottom device's at the start nodes is the start: the first pass looks it up anyway.
  const estimate = !(i > 0);

  for (let it = 0; it < MAX_ITER; it++) {
    let rmax = 0;
    let exact = true;
    for (let k = 0; k < n; k++) {
      const d = devices[k];
      // The bias goes to the lookups in an array: a number argument would be boxed (the CLI runs without inlining).
      const b = w.bias[k];
      b[0] = gates[k] - x[k];
      b[1] = x[k + 1] - x[k];
      b[2] = x[k];
      // A slice with exact slopes gives current and slopes from one lookup (written out here: a call per device and
      // pass costs, as the CLI runs without inlining); others get differences below. gmb is −∂I/∂VSB.
      if (d.slice.jdSlopes) {
        if (!d.slice.jdSlopes(b, js)) return NaN;
        const wk = d.w;
        w.id[k] = wk * js[0];
        w.gm[k] = wk * js[1];
        w.gds[k] = wk * js[2];
        w.gmb[k] = -wk * js[3];
      } else {
        exact = false;
        if (!current(d, w, k)) return NaN;
      }
      const id = w.id[k];
      // Tests that run on every pass, then a plain assignment: code only run without a start current would deopt the
      // compiled loop the first time it runs.
      if (k === 0 && it === 0 && estimate) i = id;
      r[k] = id - i;
      rmax = Math.max(rmax, Math.abs(r[k]));
    }
    if (rmax <= 1e-10 * Math.abs(i) + 1e-24) return finish(devices, w, exact) ? i : NaN;
    // Differences only when another step is needed: the converged pass costs one lookup per device.
    if (!exact) for (let k = 0; k < n; k++) if (!devices[k].slice.jdSlopes) slopes(devices[k], w, k);
    if (!chainStep(w, r, dx)) return NaN;
    // dx[0..n−2] are node steps, dx[n−1] the current step.
    let big = 0;
    for (let k = 0; k < n - 1; k++) big = Math.max(big, Math.abs(dx[k]));
    // The largest node step at most MAX_STEP; a quotient even when it is 1, so that `scale` is never a small integer
    // before optimisation (its comparison below would then be compiled for integers and deopt on the first fraction).
    let scale = MAX_STEP / Math.max(big, MAX_STEP);
    const di = dx[n - 1] * scale;
    // The current keeps a fifth of itself; the limited scale is worked out on every step, as the spread above.
    const keep = scale * ((0.8 * i) / Math.max(-di, 1e-300));
    if (i + di < 0.2 * i) scale = keep;
    if (!(scale > 0) || !Number.isFinite(scale)) return NaN;
    for (let k = 1; k < n; k++) x[k] = Math.min(Math.max(x[k] + scale * dx[k - 1], x[k - 1]), v);
    i = Math.max(i + scale * dx[n - 1], 0);
    if (!Number.isFinite(i)) return NaN;
  }
  return NaN;
}

// Finite-difference step: the Jacobian must match the interpolated jd itself
// (stored gm/gds are not its exact derivatives), or Newton only converges linearly.
const H = 1e-5;

/**
 * Working arrays of one chain length: each device's bias, current and slopes (gm, gds, gmb as −∂I/∂VSB) of
 * the latest pass, the residuals and the step. Typed arrays: a pass stores numbers without boxing them.
 */
interface Pass {
  /** Each device's [VGS, VDS, VSB], the form the slice lookups take. */
  bias: Float64Array[];
  id: Float64Array;
  gm: Float64Array;
  gds: Float64Array;
  gmb: Float64Array;
  r: Float64Array;
  dx: Float64Array;
  /** Node voltages x_0..x_N. */
  x: Float64Array;
}

/** Current at device k's bias in the pass into the pass, false outside the table. */
function current(d: StackDevice, p: Pass, k: number): boolean {
  const b = p.bias[k];
  if (!covers(d.slice, b[0], b[1], b[2])) return false;
  p.id[k] = d.w * d.slice.jd(b[0], b[1], b[2]);
  return true;
}

const js = new Float64Array(4);

/** Slopes of the current along VGS, VDS and VSB from jd alone at device k's bias in the pass (gmb as −∂I/∂VSB). */
function slopes(d: StackDevice, p: Pass, k: number): void {
  const s = d.slice;
  const b = p.bias[k];
  const vgs = b[0];
  const vds = b[1];
  const vsb = b[2];
  const id = p.id[k];
  const r = s.range;
  // Forward steps, backward at the table's upper edge.
  const hg = vgs + H <= r.vgs[1] ? H : -H;
  const hd = vds + H <= r.vds[1] ? H : -H;
  const hs = vsb + H <= r.vsb[1] ? H : -H;
  p.gm[k] = (d.w * s.jd(vgs + hg, vds, vsb) - id) / hg;
  p.gds[k] = (d.w * s.jd(vgs, vds + hd, vsb) - id) / hd;
  p.gmb[k] = -(d.w * s.jd(vgs, vds, vsb + hs) - id) / hs;
}

// Working arrays by chain length, reused across solves (the solver calls nothing that solves again). Made up front for
// the chains of stacks and stage sides: a pass first made once the solver was compiled deopted every function that
// reads one (a cold CLI run solves a triple's three devices only after the two of a cascode).
const PREMADE = 4;
const scratch: Pass[] = [];
for (let n = 0; n <= PREMADE; n++) scratch.push(newPass(n));
function scratchFor(n: number): Pass {
  return scratch[n] ?? (scratch[n] = newPass(n));
}

// Apart from scratchFor: a closure over n there would cost a context object on every call.
function newPass(n: number): Pass {
  const f = () => new Float64Array(n);
  const bias: Float64Array[] = [];
  for (let k = 0; k < n; k++) bias.push(new Float64Array(3));
  return { bias, id: f(), gm: f(), gds: f(), gmb: f(), r: f(), dx: f(), x: new Float64Array(n + 1) };
}

/**
 * Where the next solve of a chain of n devices starts: its caller writes the first nodes x_0.. here, then solves
 * (newtonSolve reads them before anything else; the array is the solver's own, so the start is never boxed).
 */
export function newtonStart(n: number): Float64Array {
  return scratchFor(n).x;
}

/**
 * The reported operating point, in the pass: table small-signal values at the solved bias (the converged pass's,
 * worked out from the nodes now held). When that pass had exact slopes (`exact`), its currents are the table's at
 * this very bias (jdSlopes gives jd bit-identical to small), so only the conductances are read; otherwise small()
 * gives them all.
 */
function finish(devices: readonly StackDevice[], p: Pass, exact: boolean): boolean {
  for (let k = 0; k < devices.length; k++) {
    const d = devices[k];
    const b = p.bias[k];
    if (exact && d.slice.conductances) {
      d.slice.conductances(b, js);
      p.gm[k] = js[0] * d.w;
      p.gds[k] = js[1] * d.w;
      p.gmb[k] = js[2] * d.w;
    } else {
      if (!covers(d.slice, b[0], b[1], b[2])) return false;
      const s = d.slice.small(b[0], b[1], b[2], js);
      p.id[k] = s[0] * d.w;
      p.gm[k] = s[1] * d.w;
      p.gds[k] = s[2] * d.w;
      p.gmb[k] = s[3] * d.w;
    }
  }
  return true;
}

/** The solution newtonSolve left for chain length n: nodes in `x`, each device's values in id..gmb. */
export type Solution = Readonly<Pick<Pass, 'x' | 'id' | 'gm' | 'gds' | 'gmb'>>;

export function solutionOf(n: number): Solution {
  return scratchFor(n);
}

/**
 * Solve J·dx = −r for the chain Jacobian without forming it: row k has
 * −(gm+gds+gmb)_k on x_{k−1}, gds_k on x_k and −1 on I. Write x_k = a_k + b_k·dI
 * and substitute upwards from x_0 = 0; the top row (x_N fixed) gives dI.
 */
function chainStep(p: Pass, r: Float64Array, dx: Float64Array): boolean {
  const n = r.length;
  let a = 0;
  let b = 0;
  for (let k = 0; k < n; k++) {
    const gds = p.gds[k];
    const src = p.gm[k] + gds + p.gmb[k];
    // −src·x_{k−1} + gds·x_k − dI = −r_k
    const ra = -r[k] + src * a;
    const rb = 1 + src * b;
    if (k === n - 1) {
      // x_N is fixed (step 0): 0 = ra + rb·dI
      if (!(Math.abs(rb) > 0)) return false;
      const di = -ra / rb;
      dx[n - 1] = di;
      return Number.isFinite(di) && fill(p, r, dx);
    }
    if (!(gds > 0)) return false;
    a = ra / gds;
    b = rb / gds;
  }
  return false;
}

// Node steps from the current step (in dx[n−1]: read there, a number argument would be boxed), by the same forward substitution.
function fill(p: Pass, r: Float64Array, dx: Float64Array): boolean {
  const di = dx[r.length - 1];
  let prev = 0;
  for (let k = 0; k < r.length - 1; k++) {
    const xk = (-r[k] + (p.gm[k] + p.gds[k] + p.gmb[k]) * prev + di) / p.gds[k];
    dx[k] = xk;
    prev = xk;
  }
  for (let k = 0; k < dx.length; k++) if (!Number.isFinite(dx[k])) return false;
  return true;
}
