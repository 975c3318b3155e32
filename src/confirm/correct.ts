import type { StackSpec } from '../spec/types.js';
import type { StackResult } from '../solve/types.js';
import type { KitAccess } from '../solve/kit.js';
import { turn, turnAll } from './knobs.js';
import { tableFigures, type TableFigures } from './table-model.js';
import type { SimulatedFigures } from './types.js';

/** What a correction step needs besides the design: where it is evaluated and what simulation showed there. */
export interface StepInput {
  design: StackResult;
  spec: StackSpec;
  kit: KitAccess;
  supply: number;
  /** Simulated figures of `design`, one per corner. */
  figures: readonly SimulatedFigures[];
}

/** Headroom aimed for below the target, V, so the corrected design does not land on the edge. */
export const HEADROOM_AIM = 0.005;
/** Finite-difference step of the knobs (ln of the width factor). */
const DELTA = 0.05;
/** Largest move of a knob in one round (ln of the width factor). */
const MAX_MOVE = { current: 0.3, headroom: 0.7 } as const;

const clamp = (x: number, m: number) => Math.max(-m, Math.min(m, x));

/**
 * The tables evaluated against a Rout target scaled by what simulation showed
 * at this corner, so table headroom and simulated headroom see the same Rout
 * margin (the tables' Rout may be a few percent off).
 */
function mapped(inp: StepInput, f: SimulatedFigures): { spec: StackSpec; at: (d: StackResult) => TableFigures | null } | null {
  const t0 = tableFigures(inp.design, inp.spec, inp.kit, f.corner, inp.supply);
  if (!t0) return null;
  const ratio = t0.rout > 0 && Number.isFinite(t0.rout) && f.rout > 0 && Number.isFinite(f.rout) ? t0.rout / f.rout : 1;
  const spec = { ...inp.spec, rout: inp.spec.rout * Math.min(2, Math.max(0.5, ratio)) };
  return { spec, at: (d) => tableFigures(d, spec, inp.kit, f.corner, inp.supply) };
}

/**
 * One correction of a design that simulation showed missing a target, by a
 * Newton step whose residuals come from simulation and whose Jacobian comes
 * from the tables (finite differences of the table evaluation of the same
 * design): the current is centred on its target over the corners with the
 * output widths, and the worst corner's headroom is brought to just below its
 * target with the top bias diode. Null when no step can help (Rout never
 * reaches its target in simulation, or the tables show no handle on headroom).
 */
export function correctionStep(inp: StepInput): StackResult | null {
  const { spec, figures } = inp;
  const logs = figures.map((f) => Math.log(f.iout / spec.current));
  const di = -(Math.max(...logs) + Math.min(...logs)) / 2;
  const worst = figures.reduce((a, b) => (b.headroom > a.headroom ? b : a));
  const missing = figures.some((f) => !(f.headroom <= spec.headroom) || !(f.routAtTarget >= spec.rout));
  const currentOnly = () => (Math.abs(di) > 1e-4 ? turn(inp.design, 'current', clamp(di, MAX_MOVE.current)) : null);
  if (!missing) return currentOnly();
  if (!Number.isFinite(worst.headroom)) return null;
  const dh = spec.headroom - HEADROOM_AIM - worst.headroom;
  const m = mapped(inp, worst);
  if (!m) return null;
  const t0 = m.at(inp.design);
  const ta = m.at(turn(inp.design, 'current', DELTA));
  const tb = m.at(turn(inp.design, 'headroom', DELTA));
  if (!t0 || !ta || !tb || ![t0.headroom, ta.headroom, tb.headroom].every(Number.isFinite)) return null;
  const j11 = Math.log(ta.iout / t0.iout) / DELTA;
  const j12 = Math.log(tb.iout / t0.iout) / DELTA;
  const j21 = (ta.headroom - t0.headroom) / DELTA;
  const j22 = (tb.headroom - t0.headroom) / DELTA;
  // A wider top diode must lower the headroom, or the tables give no handle on it here.
  if (!(j22 < -1e-3)) return null;
  const det = j11 * j22 - j12 * j21;
  if (!(Math.abs(det) > 1e-9)) return null;
  const xa = (di * j22 - j12 * dh) / det;
  const xb = (j11 * dh - j21 * di) / det;
  return turnAll(inp.design, { current: clamp(xa, MAX_MOVE.current), headroom: clamp(xb, MAX_MOVE.headroom) });
}
