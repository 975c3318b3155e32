import type { StageSpec } from '../design/types.js';
import type { KitAccess } from '../solve/kit.js';
import type { StagePredicted, StageResult } from '../solve/stage-types.js';
import { stageAsIs } from '../solve/stage-port.js';
import { stageArea, stageKnobs, turnStage, type StageKnob } from './stage-knobs.js';
import type { StageSimulatedFigures } from './stage-types.js';
import type { Miss } from './types.js';

export interface StageStepInput {
  design: StageResult;
  spec: StageSpec;
  kit: KitAccess;
  supply: number;
  /** Simulated figures of `design`, one per corner. */
  figures: readonly StageSimulatedFigures[];
}

/** Finite-difference step of the knobs (ln of the width factor). */
const DELTA = 0.1;
/** Largest move of a knob in one round. */
const MAX_MOVE = 0.7;
/** Aim this far beyond a missed target (swing in V, gain as a ratio) so the corrected design does not land on the edge. */
const SWING_AIM = 0.02;
const GAIN_AIM = 1.05;
/** Probes beside the Newton step, in units of its length; probes either way when the tables see no slope. */
const SCALES = [1, 0.5, 1.5];
const BLIND = [-0.3, -0.15, 0.15, 0.3];

const clamp = (x: number, lo: number, hi: number) => Math.max(lo, Math.min(hi, x));

/** The targets a correction is aimed at, most basic first: a stage must hold its gain before its swing, and both before its GBW. */
type Aim = 'gain' | 'swing' | 'gbw';

/** What the tables predict for a stage as sized at a corner (its bias diodes re-derive the gates); null off the tables. */
export function tablePredicted(d: StageResult, inp: Omit<StageStepInput, 'design' | 'figures'>, corner: string): StagePredicted | null {
  const at = stageAsIs(d, inp.spec, inp.kit, corner, inp.supply);
  return 'error' in at ? null : at.predicted;
}

/** The tables' figure a miss is about (gain and GBW as logs). */
function tableFigure(d: StageResult, inp: StageStepInput, corner: string, target: Aim): number | null {
  const p = tablePredicted(d, inp, corner);
  if (!p) return null;
  const v = target === 'gain' ? Math.log(Math.max(p.gain, 1e-9)) : target === 'gbw' ? (p.gbw !== null && p.gbw > 0 ? Math.log(p.gbw) : NaN) : p.swing;
  return Number.isFinite(v) ? v : null;
}

/** The residual a correction aims to close at one corner's figures, aimed a little beyond the target (null: not measurable). */
function residualOf(spec: StageSpec, f: StageSimulatedFigures, target: Aim): number | null {
  if (target === 'gain') return Math.log((spec.gain * GAIN_AIM) / Math.max(f.gain, 1e-9));
  if (target === 'swing') return spec.swing + SWING_AIM - f.swing;
  // A GBW not measured (the gain never falls to 1 in the band) gives no residual to step on.
  return spec.gbw !== undefined && f.gbw !== null && f.gbw > 0 ? Math.log((spec.gbw * GAIN_AIM) / f.gbw) : null;
}

/**
 * Corrections of a stage that simulation showed missing its gain, swing or
 * GBW (aimed at the most basic target missed: gain, then swing, then GBW):
 * for every knob, a Newton step whose residual comes from simulation (the
 * worst corner's shortfall, aimed a little beyond the target) and whose slope
 * comes from the tables (the same design re-evaluated in them with the knob
 * turned), with probes at half and one and a half times the step; a knob the
 * tables see no slope for is probed either way. Simulation picks among them
 * (pickStage: every target met, the smallest; else the nearest).
 */
export function stageCorrections(inp: StageStepInput, misses: readonly Miss[]): StageResult[] {
  const worst = misses.find((m) => m.target === 'gain') ?? misses.find((m) => m.target === 'swing') ?? misses.find((m) => m.target === 'gbw');
  if (!worst) return [];
  const f = inp.figures.find((x) => x.corner === worst.corner) ?? inp.figures[0];
  const target: Aim = worst.target === 'gain' ? 'gain' : worst.target === 'swing' ? 'swing' : 'gbw';
  const residual = residualOf(inp.spec, f, target);
  if (residual === null) return [];
  const base = tableFigure(inp.design, inp, f.corner, target);
  const out: StageResult[] = [];
  const newton: Array<[StageKnob, number]> = [];
  const knobs = stageKnobs(inp.design);
  for (const knob of knobs) {
    const moved = base === null ? null : tableFigure(turnStage(inp.design, knob, DELTA), inp, f.corner, target);
    const slope = base !== null && moved !== null ? (moved - base) / DELTA : 0;
    const sloped = Math.abs(slope) * MAX_MOVE > Math.abs(residual) * 0.1;
    if (sloped) newton.push([knob, residual / slope]);
    const moves = sloped ? SCALES.map((s) => clamp((s * residual) / slope, -MAX_MOVE, MAX_MOVE)) : BLIND;
    for (const x of new Set(moves)) out.push(turnStage(inp.design, knob, x));
  }
  // The residual shared among every sloped knob at once (each end of the swing has its own side), once and twice over.
  if (newton.length > 1) {
    for (const s of [1, 2]) out.push(newton.reduce((d, [knob, x]) => turnStage(d, knob, clamp((s * x) / newton.length, -MAX_MOVE, MAX_MOVE)), inp.design));
  }
  return out;
}

/**
 * Of stage variants simulated side by side: among those meeting every target the smallest; else among those holding
 * gain and swing (missing only GBW) the nearest, else the nearest (a GBW correction never trades away gain or swing).
 */
export function pickStage(spec: StageSpec, variants: ReadonlyArray<{ figures: readonly StageSimulatedFigures[]; misses: readonly Miss[]; design: StageResult }>): number {
  const gbwShort = (f: StageSimulatedFigures) => (spec.gbw === undefined ? 0 : f.gbw !== null && f.gbw > 0 ? Math.max(0, Math.log(spec.gbw / f.gbw)) : 50);
  const short = (v: (typeof variants)[number]) => Math.max(...v.figures.map((f) =>
    Math.max(0, (spec.swing - f.swing) / spec.swing) + (f.gain > 0 ? Math.max(0, Math.log(spec.gain / f.gain)) : 50) + gbwShort(f)));
  let best = 0;
  const basic = (v: (typeof variants)[number]) => v.misses.some((m) => m.target === 'gain' || m.target === 'swing');
  const key = (v: (typeof variants)[number]): [number, number] => (v.misses.length === 0 ? [0, stageArea(v.design)] : [basic(v) ? 2 : 1, short(v)]);
  variants.forEach((v, k) => {
    const a = key(v);
    const b = key(variants[best]);
    if (a[0] < b[0] || (a[0] === b[0] && a[1] < b[1])) best = k;
  });
  return best;
}
