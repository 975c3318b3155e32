import { REL_TOL } from '../policy.js';
import { cornersOf, type StageDesign, type StageSides } from './stage-eval.js';
import { meets, nominalOk, shortfall, stageCompare, stageMargins } from './stage-rank.js';

/**
 * The one order of stage designs, used by the pair screen's pick (pickStage) and by every climb of the refinement
 * (stageBetter): what "better" means for a stage, in this order of precedence:
 * 1. the input DC voltage within the rails (outside them: closer to them);
 * 2. meeting every target at every corner (`ok`, memoised by the caller: fullyOkMemo); two that do by the
 *    objective (stageCompare, area settling ties);
 * 3. meeting the targets at the nominal corner; two that do by their shortfalls summed over the corners, two that
 *    do not by the nominal shortfall (other corners are not traced for them);
 * 4. the smaller area.
 */

/** Meets the targets at the nominal corner and at every other corner. */
export function stageFullyOk(sides: StageSides, d: StageDesign): boolean {
  return nominalOk(sides.stage, d) && cornersOf(sides, d).every((c) => meets(stageMargins(sides.stage, c)));
}

/** Shortfalls summed over the nominal corner and every other corner (corners computed when needed). */
export function stageTotalShortfall(sides: StageSides, d: StageDesign): number {
  return cornersOf(sides, d).reduce((a, c) => a + shortfall(stageMargins(sides.stage, c)), shortfall(stageMargins(sides.stage, d.nominal)));
}

/**
 * A memoised stageFullyOk for one stage search (the traces of the search grid): what the pick, the climbs and
 * their seeds count as meeting every target. The result is then confirmed on the reported grid (stage-refine
 * okReported): on the targets' boundary, where the climb ends, the two traces' swing edges (each bisected to 0.5 mV)
 * can disagree.
 */
export function fullyOkMemo(sides: StageSides): (d: StageDesign) => boolean {
  const known = new WeakMap<StageDesign, boolean>();
  return (d) => {
    let ok = known.get(d);
    if (ok === undefined) known.set(d, (ok = stageFullyOk(sides, d)));
    return ok;
  };
}

/** True when `a` is better than `b` by the order above. */
export function stageBetter(sides: StageSides, a: StageDesign, b: StageDesign, ok: (d: StageDesign) => boolean): boolean {
  const { stage } = sides;
  const ra = stageMargins(stage, a.nominal).vin;
  const rb = stageMargins(stage, b.nominal).vin;
  if (ra >= 0 !== rb >= 0) return ra >= 0;
  if (ra < 0) return ra > rb;
  const fa = ok(a);
  const fb = ok(b);
  if (fa !== fb) return fa;
  if (fa) return stageCompare(stage.objective, a, b) < 0;
  const na = nominalOk(stage, a);
  const nb = nominalOk(stage, b);
  if (na !== nb) return na;
  const sa = na ? stageTotalShortfall(sides, a) : shortfall(stageMargins(stage, a.nominal));
  const sb = nb ? stageTotalShortfall(sides, b) : shortfall(stageMargins(stage, b.nominal));
  if (Math.abs(sa - sb) > 1e-9) return sa < sb;
  return a.area < b.area * (1 - REL_TOL);
}

/** The best of some traced designs by stageBetter (the first of equals); undefined for none. */
export function pickStage(sides: StageSides, explored: readonly StageDesign[], ok = fullyOkMemo(sides)): StageDesign | undefined {
  let best: StageDesign | undefined;
  for (const d of explored) if (!best || stageBetter(sides, d, best, ok)) best = d;
  return best;
}
