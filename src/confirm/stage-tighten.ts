import type { StageResult } from '../solve/stage-types.js';
import { tablePredicted, type StageStepInput } from './stage-correct.js';
import { scaleStage } from './stage-knobs.js';
import type { StageSimulatedFigures } from './stage-types.js';
import { TIGHTEN_MARGIN, deepestShrink } from './tighten.js';

/** Swing left above target after shrinking, V. */
const SWING_KEEP = 0.008;
/** Gain (and GBW) kept above target after shrinking (fraction). */
const RATIO_KEEP = 0.02;

/** Table figures of a stage at a corner (its bias diodes re-derive the gates, the input DC voltage re-solved); null off the tables. */
function tableAt(d: StageResult, inp: StageStepInput, corner: string): { gain: number; swing: number; gbw: number | null } | null {
  const p = tablePredicted(d, inp, corner);
  if (!p) return null;
  const { gain, swing, gbw } = p;
  return Number.isFinite(gain) && Number.isFinite(swing) ? { gain, swing, gbw } : null;
}

/** Margin enough to take back at every corner: swing ≥ target + TIGHTEN_MARGIN, gain (and GBW, if asked) above target. */
function spare(inp: StageStepInput, f: StageSimulatedFigures): boolean {
  const { spec } = inp;
  return f.swing >= spec.swing + TIGHTEN_MARGIN && f.gain > spec.gain && (spec.gbw === undefined || (f.gbw !== null && f.gbw > spec.gbw));
}

/**
 * For a confirmed stage with swing to spare in simulation (and gain, and GBW
 * when asked, above target) at every corner: every width of both sides, output
 * devices and bias diodes, shrunk by one factor, as far as the tables, offset
 * by what simulation showed at each corner (swing by the difference, gain and
 * GBW by the ratio), keep the swing SWING_KEEP above target and gain and GBW
 * RATIO_KEEP above theirs. The tables' GBW here is gm_in/(2π cap): the output
 * capacitance shrinks with the widths, so leaving it out errs on the safe side.
 * Null when there is too little margin to take back.
 */
export function stageShrinkStep(inp: StageStepInput): StageResult | null {
  const { spec, figures } = inp;
  if (!figures.every((f) => spare(inp, f))) return null;
  const base = figures.map((f) => ({ f, t: tableAt(inp.design, inp, f.corner) }));
  if (base.some(({ t }) => !t || !(t.swing > 0) || !(t.gain > 0) || (spec.gbw !== undefined && !(t.gbw && t.gbw > 0)))) return null;
  const ok = (x: number): boolean => {
    const d = scaleStage(inp.design, x);
    return base.every(({ f, t }) => {
      const s = tableAt(d, inp, f.corner);
      if (!s) return false;
      const swing = s.swing + (f.swing - t!.swing);
      const gain = s.gain * (f.gain / t!.gain);
      const gbwOk = spec.gbw === undefined || (s.gbw !== null && s.gbw * (f.gbw! / t!.gbw!) >= spec.gbw * (1 + RATIO_KEEP));
      return swing >= spec.swing + SWING_KEEP && gain >= spec.gain * (1 + RATIO_KEEP) && gbwOk;
    });
  };
  const x = deepestShrink(ok);
  return x === null ? null : scaleStage(inp.design, x);
}
