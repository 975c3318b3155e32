import type { StageObjective, StageSpec } from '../design/types.js';
import type { StageAt, StageDesign } from './stage-eval.js';
import { vinMargin } from './stage-rails.js';
import { REL_TOL } from '../policy.js';

/** Normalised margins of one traced corner (≥ 0 met): gain in ln units, swing relative to its target, gbw in ln units. */
export interface StageMargins {
  gain: number;
  swing: number;
  gbw: number;
  /** Input DC voltage inside the rails: ≥ 0 within [0, supply] (see stage-rails.ts). */
  vin: number;
}

export function stageMargins(stage: StageSpec, at: StageAt | { error: string }): StageMargins {
  if ('error' in at) return { gain: -Infinity, swing: -Infinity, gbw: -Infinity, vin: -Infinity };
  const p = at.trace.points[at.trace.j0];
  const gbw = stage.gbw === undefined ? Infinity : at.gbw !== null && at.gbw > 0 ? Math.log(at.gbw / stage.gbw) : -Infinity;
  return {
    gain: at.gainAtSwing > 0 ? Math.log(at.gainAtSwing / stage.gain) : -Infinity,
    swing: (at.trace.swing - stage.swing) / stage.swing,
    gbw,
    vin: p ? vinMargin(p.vin, at.circuit.supply) : Infinity,
  };
}

/** Met when the swing with gain ≥ target reaches the swing target (which is the gain held over it) and the gbw target holds, with the input DC voltage within the rails. */
export function meets(m: StageMargins): boolean {
  return m.swing >= -REL_TOL && m.gbw >= 0 && m.vin >= 0;
}

/** Sum of shortfalls (capped so every design still ranks). */
export function shortfall(m: StageMargins): number {
  const cap = (x: number) => Math.min(Math.max(0, -x), 50);
  return cap(m.gain) + cap(m.swing) + cap(m.gbw) + cap(m.vin);
}

export function nominalOk(stage: StageSpec, d: StageDesign): boolean {
  return meets(stageMargins(stage, d.nominal));
}

/** The input DC voltage at the design point lies within the rails (see stage-rails.ts). */
export function withinRails(stage: StageSpec, d: StageDesign): boolean {
  return stageMargins(stage, d.nominal).vin >= 0;
}

// Ties: swing within 1 mV, gain within 1 %, are settled by area.
const mv = (v: number) => Math.round(v * 1000);
const pct = (g: number) => (g > 0 ? Math.floor(Math.log(g) / Math.log(1.01)) : -Infinity);

/** Objective order of two designs meeting the targets (< 0: a is better). */
export function stageCompare(objective: StageObjective, a: StageDesign, b: StageDesign): number {
  if (objective === 'swing') {
    const d = mv(b.nominal.trace.swing) - mv(a.nominal.trace.swing);
    if (d !== 0) return d;
  } else if (objective === 'gain') {
    const d = pct(b.nominal.gain) - pct(a.nominal.gain);
    if (d !== 0 && Number.isFinite(d)) return d;
  }
  return a.area - b.area;
}
