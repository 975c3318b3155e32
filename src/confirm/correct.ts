import type { StackSpec } from '../design/types.js';
import { CURRENT_WINDOW } from '../policy.js';
import type { StackResult } from '../solve/types.js';
import type { KitAccess } from '../solve/kit.js';
import { turn, turnAll } from './knobs.js';
import { tableFigures, type TableFigures } from './table-model.js';
import type { Miss, SimulatedFigures } from './types.js';

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
/** Largest move of the current knob in one round (ln of the width factor). */
const MAX_CURRENT = 0.3;
/** Headroom-knob probes around the Newton step, in units of its length. */
const PROBES = [-2, -1, -0.5, 0.5, 1, 2];
/** Top-device widenings tried with each setpoint (ln of the width factor): Rout when the setpoint alone cannot reach it. */
const TOP_MOVES = [0, 0.35, 0.7];

const clamp = (x: number, lo: number, hi: number) => Math.max(lo, Math.min(hi, x));

/**
 * The tables evaluated against a Rout target scaled by what simulation showed
 * at this corner, so table headroom and simulated headroom see the same Rout
 * margin (the tables' Rout may be a few percent off).
 */
function mappedTable(inp: StepInput, f: SimulatedFigures): ((d: StackResult) => TableFigures | null) | null {
  const t0 = tableFigures(inp.design, inp.spec, inp.kit, f.corner, inp.supply);
  if (!t0) return null;
  const ratio = t0.rout > 0 && Number.isFinite(t0.rout) && f.rout > 0 && Number.isFinite(f.rout) ? t0.rout / f.rout : 1;
  const spec = { ...inp.spec, rout: inp.spec.rout * clamp(ratio, 0.5, 2) };
  return (d) => tableFigures(d, spec, inp.kit, f.corner, inp.supply);
}

/** Table sensitivities at one corner: d(ln iout, headroom)/d(current knob, headroom knob); null entries where the tables cannot tell. */
function jacobian(inp: StepInput, f: SimulatedFigures): { j11: number; j12: number; j21: number; j22: number } | null {
  const at = mappedTable(inp, f);
  const t0 = at?.(inp.design);
  const ta = at?.(turn(inp.design, 'current', DELTA));
  const tb = at?.(turn(inp.design, 'headroom', DELTA));
  if (!t0 || !ta || !tb || ![t0.headroom, ta.headroom, tb.headroom].every(Number.isFinite)) return null;
  return {
    j11: Math.log(ta.iout / t0.iout) / DELTA,
    j12: Math.log(tb.iout / t0.iout) / DELTA,
    j21: (ta.headroom - t0.headroom) / DELTA,
    j22: (tb.headroom - t0.headroom) / DELTA,
  };
}

/**
 * Corrections of a design that simulation showed missing a target. The
 * residuals come from simulation, the Jacobian from the tables (finite
 * differences of the table evaluation of the same design): the current is
 * centred on its target over the corners with the output widths (at fixed
 * gates the current scales with W), and the worst corner's headroom is moved
 * to just below its target with the top bias diode, i.e. the lower devices'
 * VDS setpoint. Headroom is V-shaped in the setpoint (too low: the lower
 * device's Rout knee; too high: the top device's saturation), and the
 * simulated optimum need not sit where the tables put it, so beside the
 * Newton step the same deck carries probes either side of it, each also with
 * a wider top device (more Rout at every setpoint, for more area); simulation
 * picks. Empty when nothing is missing but a converged current.
 */
export function correctionCandidates(inp: StepInput, misses: readonly Miss[]): StackResult[] {
  const { spec, figures } = inp;
  const logs = figures.map((f) => Math.log(f.iout / spec.current));
  const di = clamp(-(Math.max(...logs) + Math.min(...logs)) / 2, -MAX_CURRENT, MAX_CURRENT);
  const headroomMissed = misses.some((m) => m.target !== 'iout');
  if (!headroomMissed) return Math.abs(di) > 1e-4 ? [turn(inp.design, 'current', di)] : [];
  const worst = figures.reduce((a, b) => (b.headroom > a.headroom ? b : a));
  const j = jacobian(inp, worst);
  const dh = Number.isFinite(worst.headroom) ? spec.headroom - HEADROOM_AIM - worst.headroom : -0.05;
  const moves: number[] = [];
  let step = 0.15;
  if (j && Math.abs(j.j22) > 1e-3) {
    const det = j.j11 * j.j22 - j.j12 * j.j21;
    if (Math.abs(det) > 1e-9) {
      const newton = clamp((j.j11 * dh - j.j21 * di) / det, -0.7, 0.7);
      moves.push(newton);
      step = clamp(Math.abs(newton), 0.05, 0.35);
    }
  }
  moves.push(...PROBES.map((p) => p * step));
  // Keep the current where it belongs while the setpoint moves: the tables say how much the headroom knob shifts it.
  const j12 = j?.j12 ?? 0;
  const j11 = j && Math.abs(j.j11) > 0.2 ? j.j11 : 1;
  const tops = inp.design.devices.length > 1 ? TOP_MOVES : [0];
  return tops.flatMap((top) =>
    moves.map((xb) => turnAll(inp.design, { current: clamp((di - j12 * xb) / j11, -MAX_CURRENT, MAX_CURRENT), headroom: xb, top })),
  );
}

/**
 * Of designs simulated side by side, the one to continue with: among those
 * meeting every target the smallest (output-stack area, 1 % bins), then the
 * one with most headroom to spare; when none does, the nearest (headroom
 * excess over target in V plus the current error beyond its window).
 */
export function pickVariant(
  spec: StackSpec,
  variants: ReadonlyArray<{ figures: readonly SimulatedFigures[]; misses: readonly Miss[]; area: number }>,
): number {
  const score = (v: (typeof variants)[number]): [number, number, number] => {
    const excess = Math.max(...v.figures.map((f) => (Number.isFinite(f.headroom) ? f.headroom - spec.headroom : 10 + Math.log10(spec.rout / Math.max(f.routAtTarget, 1)))));
    const current = Math.max(...v.figures.map((f) => Math.abs(f.iout / spec.current - 1)));
    if (v.misses.length === 0) return [0, Math.round(Math.log(v.area) / 0.01), excess];
    return [1, 0, Math.max(0, excess) + Math.max(0, current - CURRENT_WINDOW)];
  };
  const less = (a: number[], b: number[]) => a[0] !== b[0] ? a[0] < b[0] : a[1] !== b[1] ? a[1] < b[1] : a[2] < b[2];
  let best = 0;
  variants.forEach((v, k) => {
    if (less(score(v), score(variants[best]))) best = k;
  });
  return best;
}
