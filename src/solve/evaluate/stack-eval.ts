import { StackwrightError } from '../../errors.js';
import type { StackSpec } from '../../design/types.js';
import {
  headroomPoint,
  holds,
  sampleAt,
  saturationVoltage,
  thermalVoltage,
  solveOperatingPoint,
  doubles,
  stackCurve,
  type CurveSample,
  type OpGuess,
  type StackDevice,
  type StackOp,
} from '../../stack/index.js';

/** A stack evaluated exactly (DC solves along the whole curve) against one spec. */
export interface StackEval {
  gates: number[];
  devices: StackDevice[];
  mid: StackOp;
  /**
   * The I–V curve's figures, packed: v, I and Rout of each point in turn (NaN where the table cannot cover it).
   * Designs keep only these numbers, not the operating points; curveFigures gives them as records.
   */
  curve: readonly number[];
  /** Provided headroom, V (Infinity when never met). */
  headroom: number;
  /** Lowest Rout over [spec.headroom, span], Ω. */
  routAtTarget: number;
  /** Lowest Rout over [max(spec.headroom, headroom), span], Ω. */
  rout: number;
  /** Current at mid-span, A. */
  iout: number;
  /** Table-derived VDSsat of each device at mid-span (EKV interpolation), V. */
  vdsat: number[];
}

/** One point of an evaluated curve: stack voltage, current and Rout (NaN where the table cannot cover it). */
export type CurveFigures = Pick<CurveSample, 'v' | 'i' | 'rout'>;

/** The points of an evaluated curve, from the lowest stack voltage up. */
export function curveFigures(ev: Pick<StackEval, 'curve'>): CurveFigures[] {
  const c = ev.curve;
  const out: CurveFigures[] = new Array(c.length / 3);
  for (let j = 0; j < out.length; j++) out[j] = { v: c[3 * j], i: c[3 * j + 1], rout: c[3 * j + 2] };
  return out;
}

/** Intervals of the reported curve (≥ 60 points); the full curve from 0 V is kept only at this resolution. */
export const CURVE_INTERVALS = 64;
/** Intervals of the scan used while ranking candidates; the chosen design is re-evaluated on the full curve. */
export const SCAN_INTERVALS = 16;

/** The exact sample at v, solved from the nearest curve point at or above it. */
function exactAt(devices: readonly StackDevice[], gates: readonly number[], curve: readonly CurveSample[], v: number): CurveSample {
  let j = curve.findIndex((c) => c.v >= v);
  if (j < 0) j = curve.length - 1;
  const guess = curve[j].op ?? curve.find((c) => c.op)?.op ?? undefined;
  return sampleAt(devices, gates, v, guess);
}

/** Lowest Rout over [at.v, span]: the exact sample `at` plus every curve point above; uncovered points count as 0. */
function minRout(curve: readonly CurveSample[], at: CurveSample): number {
  let j = curve.findIndex((c) => c.v >= at.v);
  if (j < 0) j = curve.length - 1;
  let r = Number.isFinite(at.rout) ? at.rout : 0;
  for (let k = j; k < curve.length; k++) r = Math.min(r, Number.isNaN(curve[k].rout) ? 0 : curve[k].rout);
  return r;
}

/** The mid-span operating point and each device's VDSsat there. */
export interface MidPoint {
  mid: StackOp;
  vdsat: number[];
}

/** Solve the mid-span point; null when the table cannot cover it. */
export function midPoint(devices: readonly StackDevice[], gates: readonly number[], vmid: number, guess?: OpGuess, ut = thermalVoltage()): MidPoint | null {
  let mid: StackOp;
  try {
    mid = solveOperatingPoint(devices, gates, vmid, guess);
  } catch (e) {
    if (e instanceof StackwrightError && e.kind === 'range') return null;
    throw e;
  }
  const vdsat = mid.devices.map((b, k) => saturationVoltage(devices[k].slice, b.gm / b.id, b.vsb, ut));
  return { mid, vdsat };
}

/** Curve, headroom and Rout figures from a solved mid-span point. */
export function evaluateFrom(devices: StackDevice[], gates: number[], spec: StackSpec, m: MidPoint, intervals = CURVE_INTERVALS): StackEval {
  const { mid, vdsat } = m;
  const target = { rout: spec.rout, iMid: mid.i };
  // While ranking, points below both the headroom target and the first failing point change nothing.
  const lowest = intervals >= CURVE_INTERVALS ? undefined : (c: CurveSample) => c.v < spec.headroom && !holds(c, target);
  const curve = stackCurve(devices, gates, spec.span, { intervals, anchor: mid, lowest });
  // The sample at the target headroom serves both the Rout there and, when it falls in it, the headroom search.
  const atTarget = exactAt(devices, gates, curve, spec.headroom);
  const { v: headroom, sample: atHeadroom } = headroomPoint(devices, gates, curve, target, atTarget);
  const routAtTarget = minRout(curve, atTarget);
  const rout = Number.isFinite(headroom) && headroom > spec.headroom ? minRout(curve, atHeadroom?.v === headroom ? atHeadroom : exactAt(devices, gates, curve, headroom)) : routAtTarget;
  const packed = doubles(3 * curve.length);
  for (let j = 0; j < curve.length; j++) {
    packed[3 * j] = curve[j].v;
    packed[3 * j + 1] = curve[j].i;
    packed[3 * j + 2] = curve[j].rout;
  }
  return { gates, devices, mid, curve: packed, headroom, routAtTarget, rout, iout: mid.i, vdsat };
}

/** One stack to evaluate: devices at their widths, absolute gates in stack coordinates, against a spec. */
export interface StackEvalOptions {
  devices: StackDevice[];
  gates: number[];
  spec: StackSpec;
  /** Mid-span stack voltage, V. */
  vmid: number;
  /** Start of the mid-span DC solve. */
  guess?: OpGuess;
  /** Curve intervals (default CURVE_INTERVALS). */
  intervals?: number;
  /** Thermal voltage at the corner, V (default 27 °C). */
  ut?: number;
}

/**
 * Evaluate a stack with given widths and gates: operating point at mid-span,
 * the curve from 0 to span, headroom and the Rout figures. Null when the table
 * cannot cover the mid-span point (the candidate is then infeasible).
 */
export function evaluateStack(o: StackEvalOptions): StackEval | null {
  const m = midPoint(o.devices, o.gates, o.vmid, o.guess, o.ut ?? thermalVoltage());
  return m ? evaluateFrom(o.devices, o.gates, o.spec, m, o.intervals ?? CURVE_INTERVALS) : null;
}
