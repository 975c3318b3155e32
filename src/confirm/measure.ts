import { interpolateCurve, measuredHeadroom, midSpan, routOf, type RoutPoint, type SweepPoint } from '../spice/measure.js';
import type { StackSpec } from '../design/types.js';
import type { SimulatedFigures, SimulatedPoint } from './types.js';

/** Points of the reported simulated curve: the predicted curve's resolution (64 intervals over [0, span]). */
export const CURVE_POINTS = 65;

type Targets = Pick<StackSpec, 'rout' | 'headroom' | 'span'>;

/** Lowest Rout over [lo, span] of a simulated curve, and where it is. */
export function lowestRout(curve: readonly RoutPoint[], lo: number, span: number): { rout: number; at: number } {
  let best = interpolateCurve(curve, lo);
  for (const p of curve) if (p.v > lo && p.v <= span + 1e-9 && p.rout < best.rout) best = p;
  return { rout: best.rout, at: best.v };
}

/**
 * A stack's simulated figures from its swept output current, by the README's
 * definitions: current at mid-span, Rout = dV/dI along the sweep, headroom
 * the lowest v from which Rout ≥ target and the current stays within 1 % of
 * its mid-span value up to span.
 */
export function stackFigures(points: readonly SweepPoint[], spec: Targets, corner: string): SimulatedFigures & { routAt: number } {
  const curve = routOf(points);
  const iout = interpolateCurve(curve, midSpan(spec)).iout;
  const headroom = measuredHeadroom(curve, spec);
  const low = lowestRout(curve, spec.headroom, spec.span);
  const rout = Number.isFinite(headroom) && headroom > spec.headroom ? lowestRout(curve, Math.min(headroom, spec.span), spec.span).rout : low.rout;
  const n = CURVE_POINTS - 1;
  const out: SimulatedPoint[] = [];
  for (let j = 0; j <= n; j++) {
    const p = interpolateCurve(curve, (spec.span * j) / n);
    out.push({ v: p.v, iout: p.iout, rout: p.rout });
  }
  return { corner, iout, rout, routAtTarget: low.rout, routAt: low.at, headroom, curve: out };
}
