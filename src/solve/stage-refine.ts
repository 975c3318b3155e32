import { topologyOf } from '../topology/index.js';
import { REL_TOL } from '../policy.js';
import { outputGrid, designIndex } from '../stack/index.js';
import { candidateKey, type Candidate } from './search/candidate.js';
import { neighbours } from './search/refine.js';
import { sideDesign, type Side, type SideDesign } from './stage-side.js';
import { TRACE_STEP, cornersOf, evaluateCorner, evaluatePair, stageAt, type StageDesign, type StageSides } from './stage-eval.js';
import { meets, shortfall, stageCompare, stageMargins } from './stage-rank.js';

/** Output grid step of the side traces the refinement builds (as the pair screen's), V. */
const SIDE_STEP = 0.05;
/** Climb rounds at most; each round tries the moves of both sides once. */
const MAX_ROUNDS = 24;

/** Meets the targets at the nominal corner and at every other corner. */
export function stageFullyOk(sides: StageSides, d: StageDesign): boolean {
  return meets(stageMargins(sides.stage, d.nominal)) && cornersOf(sides, d).every((c) => meets(stageMargins(sides.stage, c)));
}

/** Shortfalls summed over the nominal corner and every other corner (corners computed when needed). */
export function stageTotalShortfall(sides: StageSides, d: StageDesign): number {
  return cornersOf(sides, d).reduce((a, c) => a + shortfall(stageMargins(sides.stage, c)), shortfall(stageMargins(sides.stage, d.nominal)));
}

/**
 * Meets every target at every corner on the search grid and again on the reported grid (edges bisected on the
 * circuit): the climb walks along the targets' boundary, where the 50 mV estimate of the swing can pass a design
 * the reported trace fails. The reported check runs only for designs passing the first, once per design.
 */
function okReported(sides: StageSides, d: StageDesign, known: WeakMap<StageDesign, boolean>): boolean {
  let ok = known.get(d);
  if (ok === undefined) {
    ok = stageFullyOk(sides, d);
    if (ok) {
      const n = stageAt(sides, d.nominal.corner, d.nominal.circuit, d.nominal.gates, TRACE_STEP);
      ok = meets(stageMargins(sides.stage, n)) && sides.input.ctx.corners.slice(1).every((c) => meets(stageMargins(sides.stage, evaluateCorner(sides, d, c, TRACE_STEP))));
    }
    known.set(d, ok);
  }
  return ok;
}

/**
 * The climb's order: a design meeting every target at every corner (okReported) beats one that does not; two that
 * do are ordered by the objective (stageCompare, area settling ties); two that do not by their summed shortfall,
 * then area.
 */
export function stageBetter(sides: StageSides, a: StageDesign, b: StageDesign, known = new WeakMap<StageDesign, boolean>()): boolean {
  const fa = okReported(sides, a, known);
  const fb = okReported(sides, b, known);
  if (fa !== fb) return fa;
  if (fa) return stageCompare(sides.stage.objective, a, b) < 0;
  const sa = stageTotalShortfall(sides, a);
  const sb = stageTotalShortfall(sides, b);
  if (Math.abs(sa - sb) > 1e-9) return sa < sb;
  return a.area < b.area * (1 - REL_TOL);
}

/** Side designs of one side by candidate key (null: not realisable), shared by every climb of one stage search. */
export type SideMemo = Map<string, SideDesign | null>;

/**
 * Local refinement of a gain stage: from the pair the pair screen picked, hill-climb over the moves of one side
 * at a time — the stack climb's neighbours (each device's L to the neighbouring grid lengths, each gm/ID and
 * VDS setpoint by ± its step, and pairs of those) — with the other side held, halving the gm/ID and setpoint steps
 * when no move improves. Every move is judged exactly as one circuit (evaluatePair, every corner when it meets the
 * nominal targets) by stageBetter. With objective area a move whose summed area cannot beat a design meeting every
 * target is not traced. The screen ranks pairs on estimated gain curves from a few hundred side candidates, so its
 * pick can be far from the best nearby design (the climb is what makes the stage's result locally optimal).
 * Every design the climb evaluates is added to `pool` (the trade front and the nearest points see them).
 */
export function refineStage(
  sides: StageSides, start: StageDesign, pool: StageDesign[], memos: { input: SideMemo; load: SideMemo },
): { best: StageDesign; evaluated: number } {
  const { stage, supply } = sides;
  const vs = outputGrid(stage.output, supply, SIDE_STEP);
  const j0 = designIndex(vs, stage.output);
  const pairs = new Map<string, StageDesign | null>();
  let evaluated = 0;

  const sideOf = (side: Side, memo: SideMemo, c: Candidate, key: string): SideDesign | null => {
    let d = memo.get(key);
    if (d === undefined) {
      d = sideDesign(side, c, vs, j0, stage, supply, Infinity, false);
      // The input gate sits within the rails (as the search's input designs), and no output device is wider than
      // the width limit (as every design the stack screen proposes).
      if (d && side.kind === 'input' && !(d.sized.gates[0] <= supply)) d = null;
      if (d && d.devices.some((x) => !(x.w <= side.ctx.wmax * (1 + REL_TOL)))) d = null;
      memo.set(key, d);
    }
    return d;
  };
  const pairOf = (input: SideDesign, load: SideDesign): StageDesign | null => {
    const key = `${candidateKey(input.cand)}/${candidateKey(load.cand)}`;
    let d = pairs.get(key);
    if (d === undefined) {
      d = evaluatePair(sides, input, load);
      evaluated++;
      if (d) pool.push(d);
      pairs.set(key, d);
    }
    return d;
  };

  let best = start;
  const known = new WeakMap<StageDesign, boolean>();
  const steps = {
    input: { g: sides.input.ctx.gmidStep, v: topologyOf(start.input.cand.topology).refineVoltageStep },
    load: { g: sides.load.ctx.gmidStep, v: topologyOf(start.load.cand.topology).refineVoltageStep },
  };
  const bound = (): number => (stage.objective === 'area' && okReported(sides, best, known) ? best.area * (1 - REL_TOL) : Infinity);

  // The moves of both sides (one side moved, the other held), smallest summed area first: with objective area
  // the first move meeting every target is the best of the round and tightens the bound for the rest.
  const movesOf = (pairMoves: boolean): Array<{ input: SideDesign; load: SideDesign; area: number }> => {
    const out: Array<{ input: SideDesign; load: SideDesign; area: number }> = [];
    for (const kind of ['input', 'load'] as const) {
      const side = sides[kind];
      for (const c of neighbours(side.ctx, best[kind].cand, steps[kind].g, steps[kind].v, pairMoves)) {
        const d = sideOf(side, memos[kind], c, candidateKey(c));
        if (!d) continue;
        const input = kind === 'input' ? d : best.input;
        const load = kind === 'load' ? d : best.load;
        out.push({ input, load, area: input.area + load.area });
      }
    }
    return out.sort((a, b) => a.area - b.area);
  };
  const tryMoves = (pairMoves: boolean): boolean => {
    let improved = false;
    for (const m of movesOf(pairMoves)) {
      // Sorted by area: once one is not below the bound (finite only with objective area), none after it is.
      if (!(m.area < bound())) break;
      const p = pairOf(m.input, m.load);
      if (p && stageBetter(sides, p, best, known)) {
        best = p;
        improved = true;
      }
    }
    return improved;
  };

  for (let round = 0; round < MAX_ROUNDS; round++) {
    let improved = tryMoves(false);
    if (!improved) improved = tryMoves(true);
    if (!improved) {
      for (const s of [steps.input, steps.load]) {
        s.g /= 2;
        s.v /= 2;
      }
      if (steps.input.g < sides.input.ctx.gmidStep / 4) break;
    }
  }
  return { best, evaluated };
}
