import type { StackSpec } from '../design/types.js';
import type { StackResult } from '../solve/types.js';
import type { KitAccess } from '../solve/kit.js';
import { stackLines } from '../spice/netlist.js';
import type { BatchCircuit, BatchColumns } from './batch.js';
import { stackMisses } from './check.js';
import { correctionCandidates, pickVariant } from './correct.js';
import type { ConfirmItem } from './hook.js';
import { nearestKeeper, simulatedOf } from './hook.js';
import { stackFigures } from './measure.js';
import { tableFigures } from './table-model.js';
import { shrinkStep } from './tighten.js';
import { reportedMiss, reportedSimulated } from './reported.js';
import { reportedHeadroom } from '../policy.js';
import type { Confirmation, CorrectedDesign, SimulatedFigures } from './types.js';

type Figures = SimulatedFigures & { routAt: number };

export interface StackContext {
  kit: KitAccess;
  supply: number;
  models: { n: string; p: string };
  /** Corner the design was sized on (its gates are reported there). */
  nominal: string;
}

/** A sized stack as a confirm item: diode-biased circuit, sweep of the stack voltage, table-Jacobian correction. */
export function stackItem(result: StackResult, spec: StackSpec, ctx: StackContext): ConfirmItem<Figures> {
  const original = result;
  let design = result;
  let variants: StackResult[] = [result];
  // Continue with design d (the only variant until a correction or shrink proposes more).
  const use = (d: StackResult) => {
    design = d;
    variants = [d];
  };
  let confirmed: StackResult | null = null;
  let confirmedFigures: Figures[] | null = null;
  const step = (figures: Figures[]) => ({ design, spec, kit: ctx.kit, supply: ctx.supply, figures });
  // pickVariant keeps index 0 on a tie: the design held is listed first.
  const tried = nearestKeeper<StackResult, Figures>((a, b) =>
    pickVariant(spec, [{ ...b, area: areaOf(b.design) }, { ...a, area: areaOf(a.design) }]) === 1);
  return {
    name: result.name,
    sweepTop: spec.span,
    variants: () => variants.length,
    circuit(tag: string, k: number): BatchCircuit {
      const lines = stackLines(variants[k], tag, { supply: ctx.supply, bias: 'diodes' }, ctx.models, spec);
      return { tag, lines, vectors: [`i(vm_${tag})`] };
    },
    measure(data: BatchColumns, corner: string): Figures {
      const points = Array.from(data.sweep, (v, j) => ({ v, iout: data.columns[0][j] }));
      return stackFigures(points, spec, corner);
    },
    misses: (f) => stackMisses(spec, f),
    pick: (results) => pickVariant(spec, results.map((r, k) => ({ ...r, area: areaOf(variants[k]) }))),
    select: (k) => use(variants[k]),
    correct(figures, misses) {
      const next = correctionCandidates(step(figures), misses);
      if (next.length === 0) return false;
      variants = next;
      return true;
    },
    shrink(figures) {
      const next = shrinkStep(step(figures));
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
    outcome(last, misses, rounds, ok, tightened): Confirmation {
      const figures = ok && confirmedFigures ? confirmedFigures : last;
      const out: Confirmation = { name: result.name, simulated: reportedSimulated(simulatedOf(figures)), confirmed: ok, rounds, misses: misses.map(reportedMiss) };
      if (design !== original) out.corrected = correctedOf(design, spec, ctx);
      if (tightened) out.tightened = true;
      return out;
    },
  };
}

function areaOf(d: StackResult): number {
  return d.devices.reduce((a, x) => a + x.w * x.l, 0);
}

/** The corrected design as drawn, with its gates and table figures at the nominal corner. */
function correctedOf(design: StackResult, spec: StackSpec, ctx: StackContext): CorrectedDesign {
  const t = tableFigures(design, spec, ctx.kit, ctx.nominal, ctx.supply);
  const gateOf = (role: string, fallback: number) => {
    const k = design.bias.findIndex((b) => b.drives === role);
    return t && k >= 0 ? t.gates[k] : fallback;
  };
  return {
    devices: design.devices.map((d) => ({ role: d.role, w: d.w, l: d.l, gate: gateOf(d.role, d.gate) })),
    bias: design.bias.map((b, k) => ({ ...b, voltage: t ? t.gates[k] : b.voltage })),
    area: areaOf(design),
    predicted: t ? { iout: t.iout, rout: t.rout, headroom: reportedHeadroom(t.headroom) } : { iout: NaN, rout: NaN, headroom: Infinity },
  };
}

export type { Figures as StackFigures };
