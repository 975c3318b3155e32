import type { DeviceBias, OpGuess, StackDevice, StackOp } from './types.js';
import { emptyBias, evalDevice } from './evaluate-device.js';
import { covers } from './range.js';

const MAX_ITER = 40;
// A step limit keeps Newton from leaping across the saturation knee, where gds is tiny.
const MAX_STEP = 0.1;

/**
 * Newton on KCL of the series chain: unknowns x_1..x_{N−1} and I, residuals
 * r_k = W_k·jd_k(g_k − x_{k−1}, x_k − x_{k−1}, x_{k−1}) − I. Returns null when
 * it leaves the table or does not converge, so the caller can fall back.
 */
export function newtonOperatingPoint(devices: readonly StackDevice[], gates: readonly number[], v: number, guess: OpGuess): StackOp | null {
  const n = devices.length;
  const x = new Array<number>(n + 1);
  x[0] = 0;
  x[n] = v;
  for (let k = 1; k < n; k++) x[k] = Math.min(Math.max(guess.nodes[k] ?? (v * k) / n, x[k - 1]), v);
  const { slope, r, dx } = scratchFor(n);
  let i = guess.i;
  if (!(i > 0)) {
    if (!covers(devices[0].slice, gates[0], x[1], 0)) return null;
    i = devices[0].w * devices[0].slice.jd(gates[0], x[1], 0);
  }

  for (let it = 0; it < MAX_ITER; it++) {
    let rmax = 0;
    let exact = true;
    for (let k = 0; k < n; k++) {
      const b = slope[k];
      const d = devices[k];
      // A slice with exact slopes gives current and slopes from one lookup; others get differences below.
      const ok = d.slice.jdSlopes ? currentAndSlopes(d, gates[k] - x[k], x[k + 1] - x[k], x[k], b) : ((exact = false), current(d, gates[k] - x[k], x[k + 1] - x[k], x[k], b));
      if (!ok) return null;
      r[k] = b.id - i;
      rmax = Math.max(rmax, Math.abs(r[k]));
    }
    if (rmax <= 1e-10 * Math.abs(i) + 1e-24) return finish(devices, gates, v, i, x, exact ? slope : null);
    // Differences only when another step is needed: the converged pass costs one lookup per device.
    if (!exact) for (let k = 0; k < n; k++) if (!devices[k].slice.jdSlopes) slopes(devices[k], slope[k]);
    if (!chainStep(slope, r, dx)) return null;
    // dx[0..n−2] are node steps, dx[n−1] the current step.
    let scale = 1;
    for (let k = 0; k < n - 1; k++) scale = Math.min(scale, MAX_STEP / Math.max(Math.abs(dx[k]), 1e-300));
    const di = dx[n - 1] * scale;
    if (i + di < 0.2 * i) scale *= (0.8 * i) / Math.max(-di, 1e-300);
    if (!(scale > 0) || !Number.isFinite(scale)) return null;
    for (let k = 1; k < n; k++) x[k] = Math.min(Math.max(x[k] + scale * dx[k - 1], x[k - 1]), v);
    i = Math.max(i + scale * dx[n - 1], 0);
    if (!Number.isFinite(i)) return null;
  }
  return null;
}

// Finite-difference step: the Jacobian must match the interpolated jd itself
// (stored gm/gds are not its exact derivatives), or Newton only converges linearly.
const H = 1e-5;

/** Current at a bias into `out` (with the bias), false outside the table. */
function current(d: StackDevice, vgs: number, vds: number, vsb: number, out: DeviceBias): boolean {
  if (!covers(d.slice, vgs, vds, vsb)) return false;
  out.vgs = vgs;
  out.vds = vds;
  out.vsb = vsb;
  out.id = d.w * d.slice.jd(vgs, vds, vsb);
  return true;
}

const js = new Float64Array(4);

/** Current and its exact slopes (the interpolant's derivatives, gmb as −∂I/∂VSB) into `out`; false outside the table. */
function currentAndSlopes(d: StackDevice, vgs: number, vds: number, vsb: number, out: DeviceBias): boolean {
  if (!covers(d.slice, vgs, vds, vsb)) return false;
  d.slice.jdSlopes!(vgs, vds, vsb, js);
  const w = d.w;
  out.vgs = vgs;
  out.vds = vds;
  out.vsb = vsb;
  out.id = w * js[0];
  out.gm = w * js[1];
  out.gds = w * js[2];
  out.gmb = -w * js[3];
  return true;
}

/** Slopes of the current along VGS, VDS and VSB from jd alone at the bias in `out` (gmb as −∂I/∂VSB). */
function slopes(d: StackDevice, out: DeviceBias): void {
  const s = d.slice;
  const { vgs, vds, vsb, id } = out;
  const r = s.range;
  // Forward steps, backward at the table's upper edge.
  const hg = vgs + H <= r.vgs[1] ? H : -H;
  const hd = vds + H <= r.vds[1] ? H : -H;
  const hs = vsb + H <= r.vsb[1] ? H : -H;
  out.gm = (d.w * s.jd(vgs + hg, vds, vsb) - id) / hg;
  out.gds = (d.w * s.jd(vgs, vds + hd, vsb) - id) / hd;
  out.gmb = -(d.w * s.jd(vgs, vds, vsb + hs) - id) / hs;
}

// Working arrays per chain length, reused across solves (the solver is not re-entrant).
const scratch = new Map<number, { slope: DeviceBias[]; r: Float64Array; dx: Float64Array }>();
function scratchFor(n: number): { slope: DeviceBias[]; r: Float64Array; dx: Float64Array } {
  let s = scratch.get(n);
  if (!s) scratch.set(n, (s = { slope: Array.from({ length: n }, emptyBias), r: new Float64Array(n), dx: new Float64Array(n) }));
  return s;
}

/**
 * The reported operating point: table small-signal values at the solved bias. `last` is the converged pass
 * (exact slopes): its currents are the table's at this very bias (jdSlopes gives jd bit-identical to small),
 * so only the conductances are read.
 */
function finish(devices: readonly StackDevice[], gates: readonly number[], v: number, i: number, x: number[], last: readonly DeviceBias[] | null): StackOp | null {
  const out: DeviceBias[] = new Array(devices.length);
  for (let k = 0; k < devices.length; k++) {
    const b = emptyBias();
    const d = devices[k];
    if (last && d.slice.conductances) {
      const p = last[k];
      d.slice.conductances(p.vgs, p.vds, p.vsb, js);
      b.vgs = p.vgs;
      b.vds = p.vds;
      b.vsb = p.vsb;
      b.id = p.id;
      b.gm = js[0] * d.w;
      b.gds = js[1] * d.w;
      b.gmb = js[2] * d.w;
    } else if (!evalDevice(d, gates[k] - x[k], x[k + 1] - x[k], x[k], b)) return null;
    out[k] = b;
  }
  return { v, i, nodes: x, devices: out };
}

/**
 * Solve J·dx = −r for the chain Jacobian without forming it: row k has
 * −(gm+gds+gmb)_k on x_{k−1}, gds_k on x_k and −1 on I. Write x_k = a_k + b_k·dI
 * and substitute upwards from x_0 = 0; the top row (x_N fixed) gives dI.
 */
function chainStep(bias: readonly DeviceBias[], r: Float64Array, dx: Float64Array): boolean {
  const n = bias.length;
  let a = 0;
  let b = 0;
  for (let k = 0; k < n; k++) {
    const d = bias[k];
    const src = d.gm + d.gds + d.gmb;
    // −src·x_{k−1} + gds·x_k − dI = −r_k
    const ra = -r[k] + src * a;
    const rb = 1 + src * b;
    if (k === n - 1) {
      // x_N is fixed (step 0): 0 = ra + rb·dI
      if (!(Math.abs(rb) > 0)) return false;
      const di = -ra / rb;
      dx[n - 1] = di;
      return Number.isFinite(di) && fill(bias, r, dx, di);
    }
    if (!(d.gds > 0)) return false;
    a = ra / d.gds;
    b = rb / d.gds;
  }
  return false;
}

// Node steps from the current step, by the same forward substitution.
function fill(bias: readonly DeviceBias[], r: Float64Array, dx: Float64Array, di: number): boolean {
  let prev = 0;
  for (let k = 0; k < bias.length - 1; k++) {
    const d = bias[k];
    const xk = (-r[k] + (d.gm + d.gds + d.gmb) * prev + di) / d.gds;
    dx[k] = xk;
    prev = xk;
  }
  for (let k = 0; k < dx.length; k++) if (!Number.isFinite(dx[k])) return false;
  return true;
}
