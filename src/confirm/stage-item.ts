import type { StageSpec } from '../design/types.js';
import type { KitAccess } from '../solve/kit.js';
import type { StageResult, StageSide } from '../solve/stage-types.js';
import { nearestKeeper, type ConfirmItem } from './hook.js';
import { stageMisses } from './stage-check.js';
import { stageCircuit } from './stage-circuit.js';
import { pickStage, stageCorrections } from './stage-correct.js';
import { stageArea } from './stage-knobs.js';
import { stageShrinkStep } from './stage-tighten.js';
import { stageFigures } from './stage-measure.js';
import type { CorrectedSide, StageConfirmation, StageSimulatedFigures } from './stage-types.js';

export interface StageContext {
  kit: KitAccess;
  supply: number;
  models: { n: string; p: string };
}

/**
 * A sized gain stage as a confirm item: both sides diode-biased, the output
 * held on the shared sweep by a loop driving the input (the input DC source of
 * the transfer curve), gain and swing measured as the README defines them,
 * with a gbw target also the unity-gain frequency from an AC analysis,
 * corrected with table-sloped steps of the cascode setpoints and devices.
 */
export function stageItem(result: StageResult, spec: StageSpec, ctx: StageContext): ConfirmItem<StageSimulatedFigures, StageConfirmation> {
  const original = result;
  const vin0 = result.predicted.vin;
  let design = result;
  let variants: StageResult[] = [result];
  // Continue with design d (the only variant until a correction or shrink proposes more).
  const use = (d: StageResult) => {
    design = d;
    variants = [d];
  };
  let confirmed: StageResult | null = null;
  let confirmedFigures: StageSimulatedFigures[] | null = null;
  // A gbw target (it comes with its cap) adds the small-signal response at the design point to the same deck.
  // pickStage keeps index 0 on a tie: the design held is listed first.
  const tried = nearestKeeper<StageResult, StageSimulatedFigures>((a, b) => pickStage(spec, [b, a]) === 1);
  const ac = spec.gbw !== undefined && spec.cap !== undefined ? { cap: spec.cap, output: spec.output } : undefined;
  return {
    name: result.name,
    // The output is held over the whole supply: the swing ends are wherever the gain falls.
    sweepTop: ctx.supply,
    variants: () => variants.length,
    circuit: (tag, k) => stageCircuit(variants[k], tag, vin0, ctx.models, ac),
    measure: (data, corner) => stageFigures(data, vin0, spec, corner),
    misses: (f) => stageMisses(spec, f),
    pick: (results) => pickStage(spec, results.map((r, k) => ({ ...r, design: variants[k] }))),
    select: (k) => use(variants[k]),
    correct(figures, misses) {
      const next = stageCorrections({ design, spec, kit: ctx.kit, supply: ctx.supply, figures }, misses);
      if (next.length === 0) return false;
      variants = next;
      return true;
    },
    shrink(figures) {
      const next = stageShrinkStep({ design, spec, kit: ctx.kit, supply: ctx.supply, figures });
      if (!next) return false;
      variants = [next];
      return true;
    },
    revert: () => use(confirmed ?? design),
    keep(figures) {
      confirmed = design;
      confirmedFigures = figures;
    },
    hold: (figures, misses) => tried.hold({ design, figures, misses }),
    nearest: () => tried.back(use),
    outcome(last, misses, rounds, ok, tightened): StageConfirmation {
      const figures = ok && confirmedFigures ? confirmedFigures : last;
      const out: StageConfirmation = { name: result.name, simulated: { ...figures[0], corners: figures }, confirmed: ok, rounds, misses };
      if (design !== original) out.corrected = { input: sideOf(design.input), load: sideOf(design.load), area: stageArea(design) };
      if (tightened) out.tightened = true;
      return out;
    },
  };
}

function sideOf(side: StageSide): CorrectedSide {
  return { devices: side.devices.map((d) => ({ role: d.role, w: d.w, l: d.l })), bias: side.bias.map((b) => ({ ...b })) };
}
