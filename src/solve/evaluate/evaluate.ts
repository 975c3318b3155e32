import { StackwrightError } from '../../errors.js';
import type { StackSpec } from '../../design/types.js';
import type { MismatchCoefficients } from '../../table/types.js';
import type { LengthSlice } from '../../device/types.js';
import { biasDevices, biasGates, sampleAt, sizeStackDevices, type BiasDevice, type SizedStack, type StackDevice, type StackOp } from '../../stack/index.js';
import { topologyOf } from '../../topology/index.js';
import type { Candidate } from '../search/candidate.js';
import type { SolveContext } from '../context.js';
import { marginsOf, saturationMargin, type Margins } from './checks.js';
import { currentMargin, distanceToFeasible, meetsAll } from '../../policy.js';
import { pelgromSigma } from './mismatch.js';
import { CURVE_INTERVALS, SCAN_INTERVALS, evaluateFrom, evaluateStack, midPoint, type MidPoint, type StackEval } from './stack-eval.js';

/** The same design re-evaluated at another corner with the gates its bias diodes produce there. */
export interface CornerEval {
  corner: string;
  gates: number[];
  ev: StackEval | null;
  sigma?: number;
  margins: Margins;
  /** True when only the quick rejection test ran (Rout at the target headroom, mid-span current). */
  quick?: boolean;
}

/** A candidate sized and evaluated exactly on the nominal corner. */
export interface Evaluated {
  cand: Candidate;
  slices: LengthSlice[];
  sized: SizedStack;
  bias: BiasDevice[];
  nominal: StackEval;
  area: number;
  biasArea: number;
  sigma?: number;
  margins: Margins;
  /** Other corners, filled on demand (only for designs that could win). */
  corners?: CornerEval[];
  /** Curve intervals the evaluation used (scan while ranking, full for the report). */
  intervals: number;
}

/** f(), or null when it throws a 'range' error (the tables cannot cover the bias). */
export function rangeSafe<T>(f: () => T): T | null {
  try {
    return f();
  } catch (e) {
    if (e instanceof StackwrightError && e.kind === 'range') return null;
    throw e;
  }
}

/** Pelgrom σ of the bottom device at its actual gm/ID, when the kit has coefficients. */
export function sigmaFor(coeff: MismatchCoefficients | undefined, ev: StackEval): number | undefined {
  if (!coeff) return undefined;
  const b = ev.mid.devices[0];
  const d = ev.devices[0];
  return pelgromSigma(b.gm / b.id, d.w, d.slice.l, coeff);
}

/** A candidate sized on the nominal corner (the table's answer, null when it cannot realise it). */
function sizeOf(ctx: SolveContext, cand: Candidate): { slices: LengthSlice[]; sized: SizedStack | null } {
  const slices = cand.l.map((l) => ctx.slice(ctx.nominal, l));
  // wmin 0 checks nothing (startOf judges the minimum width itself), but gives the design the shape the stage
  // sides' designs have, so sizeStackDevices sees one shape and is not deoptimised when the stage starts.
  const sized = sizeStackDevices({
    shape: topologyOf(cand.topology), slices, gmid: cand.gmid, setpoints: cand.setpoints, current: ctx.spec.current, vmid: ctx.vmid, wmin: 0,
  });
  return { slices, sized };
}

/** Where every exact evaluation of a candidate starts: its sizing and its mid-span DC solve on the nominal corner. */
export interface Start {
  slices: LengthSlice[];
  sized: SizedStack;
  devices: StackDevice[];
  mid: MidPoint;
}

/**
 * The start of a candidate, or why there is none: 'none' when the table cannot realise it, 'narrow' when a device
 * would be narrower than the minimum width. Throws a 'range' error where the tables end (callers use rangeSafe).
 */
export function startOf(ctx: SolveContext, cand: Candidate): Start | 'none' | 'narrow' {
  const { slices, sized } = sizeOf(ctx, cand);
  if (!sized) return 'none';
  if (sized.w.some((w) => w < ctx.wmin * (1 - 1e-9))) return 'narrow';
  const devices: StackDevice[] = slices.map((slice, k) => ({ slice, w: sized.w[k] }));
  const mid = midPoint(devices, sized.gates, ctx.vmid, { i: ctx.spec.current, nodes: sized.nodes }, ctx.ut(ctx.nominal));
  return mid ? { slices, sized, devices, mid } : 'none';
}

/**
 * The bias diodes of a sized candidate, a diode narrower than the minimum width at a longer table length; null when
 * no length realises one. Throws a 'range' error where the tables end (callers use rangeSafe).
 */
function biasOf(ctx: SolveContext, cand: Candidate, slices: readonly LengthSlice[], sized: SizedStack): BiasDevice[] | null {
  return biasDevices(topologyOf(cand.topology), slices, sized.gates, ctx.ib, {
    wmin: ctx.wmin, lengths: ctx.lengths, slice: (l) => ctx.slice(ctx.nominal, l),
  });
}

/**
 * Whether the sizing alone (no DC solve) shows a candidate cannot be realised, as the exact evaluation would find: the
 * table has no such device, a device is narrower than the minimum width, or no length realises a bias diode.
 */
export function sizingUnrealisable(ctx: SolveContext, cand: Candidate): boolean {
  const r = rangeSafe(() => {
    const { slices, sized } = sizeOf(ctx, cand);
    return sized !== null && sized.w.every((w) => w >= ctx.wmin * (1 - 1e-9)) && biasOf(ctx, cand, slices, sized) !== null;
  });
  return r !== true;
}

/**
 * Size and evaluate one candidate exactly; null when the table cannot realise
 * it, a device would be narrower than the minimum width (bias diodes first try
 * longer lengths), or a device below the top one is not saturated at mid-span.
 * `start`, when the caller already has it (a quick look), spares its sizing and mid-span solve.
 */
export function evaluateCandidate(ctx: SolveContext, cand: Candidate, start?: Start): Evaluated | null {
  ctx.count.exact++;
  return rangeSafe(() => {
    const st = start ?? startOf(ctx, cand);
    if (st === 'none') return null;
    if (st === 'narrow') return reject(ctx, 'narrow');
    const { slices, sized, devices, mid: m } = st;
    if (ctx.saturation === 'require' && saturationMargin(m) < 0) return reject(ctx, 'triode');
    const bias = biasOf(ctx, cand, slices, sized);
    if (!bias) return reject(ctx, 'narrow');
    const nominal = evaluateFrom(devices, sized.gates, ctx.spec, m, SCAN_INTERVALS);
    const sigma = sigmaFor(ctx.coeff, nominal);
    return {
      cand, slices, sized, bias, nominal, sigma,
      area: devices.reduce((a, d) => a + d.w * d.slice.l, 0),
      biasArea: bias.reduce((a, b) => a + b.w * b.l, 0),
      margins: marginsOf(ctx.spec, nominal, sigma),
      intervals: SCAN_INTERVALS,
    };
  });
}

/** Widths of a candidate's output devices from its sizing alone (no DC solves); null when the table cannot realise it. */
export function candidateWidths(ctx: SolveContext, cand: Candidate): ArrayLike<number> | null {
  return rangeSafe(() => sizeOf(ctx, cand).sized)?.w ?? null;
}

function reject(ctx: SolveContext, why: 'narrow' | 'triode'): null {
  ctx.count[why]++;
  return null;
}

/** One evaluation of a sized design at a corner: the same W, L and bias diodes there. */
export interface EvaluateOptions {
  spec: StackSpec;
  corner: string;
  /** Output devices on the corner's slices, at their widths. */
  devices: StackDevice[];
  /** Bias diodes and their slices on the corner: they set the gates there (the mirror tracks the corner). */
  bias: readonly Pick<BiasDevice, 'w' | 'current' | 'stackedOn' | 'drives'>[];
  biasSlices: LengthSlice[];
  /** Start of the mid-span DC solve (design bias). */
  guess: { i: number; nodes: number[] };
  vmid: number;
  /** Thermal voltage at the corner, V. */
  ut: number;
  intervals: number;
  coeff?: MismatchCoefficients;
  /** Stop after a cheap rejection test (two DC solves) when it already fails. */
  quick?: boolean;
}

/**
 * Evaluate a sized design at one corner: gates from its bias diodes there,
 * the stack on the corner's tables, σ and margins. Outside the tables counts
 * as not met (ev null). `quick` first tries a cheap rejection (Rout at the
 * target headroom bounds the worst Rout from above, and the mid-span current).
 */
export function evaluateAt(o: EvaluateOptions): CornerEval {
  const { spec, corner } = o;
  const gates = rangeSafe(() => biasGates(o.bias, o.biasSlices));
  if (!gates) return { corner, gates: [], ev: null, margins: marginsOf(spec, null, undefined) };
  if (o.quick) {
    const q = quickReject(spec, o.vmid, o.devices, gates, o.guess);
    if (q) return { corner, gates, ev: null, margins: q, quick: true };
  }
  const ev = rangeSafe(() => evaluateStack({ devices: o.devices, gates, spec, vmid: o.vmid, guess: o.guess, intervals: o.intervals, ut: o.ut }));
  const sigma = ev ? sigmaFor(o.coeff, ev) : undefined;
  return { corner, gates, ev, sigma, margins: marginsOf(spec, ev, sigma) };
}

/** Re-evaluate a search candidate at one other corner (same W, L and bias devices). */
export function evaluateCorner(ctx: SolveContext, e: Evaluated, corner: string, quick = false): CornerEval {
  return evaluateAt({
    spec: ctx.spec, corner,
    devices: e.cand.l.map((l, k) => ({ slice: ctx.slice(corner, l), w: e.sized.w[k] })),
    bias: e.bias, biasSlices: e.bias.map((b) => ctx.slice(corner, b.l)),
    guess: { i: ctx.spec.current, nodes: e.sized.nodes },
    vmid: ctx.vmid, ut: ctx.ut(corner), intervals: e.intervals, coeff: ctx.coeff, quick,
  });
}

// Margins from two DC solves when they already show a miss (headroom and saturation left unjudged at 0), else null.
function quickReject(s: StackSpec, vmid: number, devices: StackDevice[], gates: number[], guess: { i: number; nodes: number[] }): Margins | null {
  const mid = sampleAt(devices, gates, vmid, solveGuess(guess, vmid));
  if (!mid.op) return marginsOf(s, null, undefined);
  const at = sampleAt(devices, gates, s.headroom, mid.op);
  const rout = at.op ? Math.log(at.rout / s.rout) : -Infinity;
  const iout = currentMargin(mid.i, s.current);
  if (rout >= 0 && iout >= 0) return null;
  return { rout, iout, headroom: 0, mismatch: Infinity, saturation: 0, width: 0 };
}

function solveGuess(g: { i: number; nodes: number[] }, v: number): StackOp {
  return { v, i: g.i, nodes: g.nodes, devices: [] };
}

/** Fill in the other corners once (quick rejections allowed unless `full`). */
export function ensureCorners(ctx: SolveContext, e: Evaluated, full = false): CornerEval[] {
  e.corners ??= ctx.corners.slice(1).map((c) => evaluateCorner(ctx, e, c, !full));
  if (full) e.corners = e.corners.map((c) => (c.quick ? evaluateCorner(ctx, e, c.corner, false) : c));
  return e.corners;
}

export function nominalOk(e: Evaluated): boolean {
  return meetsAll(e.margins);
}

/** Meets every target at every corner (computes the corners if needed). */
export function fullyOk(ctx: SolveContext, e: Evaluated): boolean {
  return nominalOk(e) && ensureCorners(ctx, e).every((c) => meetsAll(c.margins));
}

/** Total shortfall over the corners evaluated so far. */
export function totalViolation(e: Evaluated): number {
  return distanceToFeasible(e.margins) + (e.corners ?? []).reduce((a, c) => a + distanceToFeasible(c.margins), 0);
}

/**
 * Re-evaluate a design on the full reported curve (all corners again), in
 * place. Returns false when the design no longer meets targets it met on the
 * ranking scan, so the caller can fall back to the next one.
 */
export function finalize(ctx: SolveContext, e: Evaluated): boolean {
  if (e.intervals === CURVE_INTERVALS) return true;
  const wasOk = nominalOk(e) && (e.corners === undefined || e.corners.every((c) => meetsAll(c.margins)));
  const full = evaluateStack({ devices: e.nominal.devices, gates: e.nominal.gates, spec: ctx.spec, vmid: ctx.vmid, guess: { i: ctx.spec.current, nodes: e.sized.nodes }, intervals: CURVE_INTERVALS, ut: ctx.ut(ctx.nominal) });
  e.intervals = CURVE_INTERVALS;
  if (!full) {
    e.margins = marginsOf(ctx.spec, null, e.sigma);
    return false;
  }
  e.nominal = full;
  e.sigma = sigmaFor(ctx.coeff, full);
  e.margins = marginsOf(ctx.spec, full, e.sigma);
  e.corners = undefined;
  return !wasOk || fullyOk(ctx, e);
}
