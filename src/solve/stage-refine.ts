import { topologyOf } from '../topology/index.js';
import { REL_TOL } from '../policy.js';
import { designIndex, guessOf, outputGrid, stagePoint } from '../stack/index.js';
import { candidateKey, type Candidate } from './search/candidate.js';
import { neighbours } from './search/refine.js';
import { sideDesign, type Side, type SideDesign } from './stage-side.js';
import { TRACE_STEP, cornersOf, evaluateCorner, evaluatePair, pairCircuit, stageAt, type StageDesign, type StageSides } from './stage-eval.js';
import { meets, shortfall, stageCompare, stageMargins } from './stage-rank.js';
import { rangeSafe } from './evaluate/evaluate.js';

/** Output grid step of the side traces the refinement builds (as the pair screen's), V. */
const SIDE_STEP = 0.05;
/** Span of surelyMisses' secant at a swing edge, V. */
const SECANT_STEP = 0.01;
/** How far outside a swing edge surelyMisses looks, V (below the traces' 0.5 mV edge resolution). */
const EDGE_GAP = 1e-4;
/** Designs the climbs start from, per load topology (two pass the exhaustive-reference tests; each more costs a climb). */
const SEEDS = 2;
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

/** Meets every target at every corner on the reported grid (as the result will be traced). */
function okReported(sides: StageSides, d: StageDesign): boolean {
  const n = stageAt(sides, d.nominal.corner, d.nominal.circuit, d.nominal.gates, TRACE_STEP);
  return meets(stageMargins(sides.stage, n)) && sides.input.ctx.corners.slice(1).every((c) => meets(stageMargins(sides.stage, evaluateCorner(sides, d, c, TRACE_STEP))));
}

/**
 * A memoised stageFullyOk for one stage search (the traces of the search grid): what the climb and its seeds count
 * as meeting every target. The result is then confirmed on the reported grid (okReported): on the targets'
 * boundary, where the climb ends, the two traces' swing edges (each bisected to 0.5 mV) can disagree.
 */
function climbOk(sides: StageSides): (d: StageDesign) => boolean {
  const known = new WeakMap<StageDesign, boolean>();
  return (d) => {
    let ok = known.get(d);
    if (ok === undefined) known.set(d, (ok = stageFullyOk(sides, d)));
    return ok;
  };
}

/**
 * The climb's order: a design meeting every target at every corner (`ok`) beats one that does not; two that do
 * are ordered by the objective (stageCompare, area settling ties); two that do not by their summed shortfall,
 * then area.
 */
function stageBetter(sides: StageSides, a: StageDesign, b: StageDesign, ok: (d: StageDesign) => boolean): boolean {
  const fa = ok(a);
  const fb = ok(b);
  if (fa !== fb) return fa;
  if (fa) return stageCompare(sides.stage.objective, a, b) < 0;
  const sa = stageTotalShortfall(sides, a);
  const sb = stageTotalShortfall(sides, b);
  if (Math.abs(sa - sb) > 1e-9) return sa < sb;
  return a.area < b.area * (1 - REL_TOL);
}

/**
 * Climb seeds: the pick, then the best design of each other pair of length choices in the screen's pool (by the
 * climb's order), SEEDS in all. A climb rarely changes a length by more than a step, so the lengths pick the basin.
 */
function seedsOf(sides: StageSides, picked: StageDesign, pool: readonly StageDesign[], ok: (d: StageDesign) => boolean): StageDesign[] {
  const rest = pool.filter((d) => d !== picked).sort((a, b) => (stageBetter(sides, a, b, ok) ? -1 : stageBetter(sides, b, a, ok) ? 1 : 0));
  const lengths = (d: StageDesign) => `${d.input.cand.l.join(',')}/${d.load.cand.l.join(',')}`;
  const seen = new Set([lengths(picked)]);
  const out = [picked];
  for (const d of rest) {
    if (out.length >= SEEDS) break;
    if (seen.has(lengths(d))) continue;
    seen.add(lengths(d));
    out.push(d);
  }
  return out;
}

/** Side designs of one side by candidate key (null: not realisable), shared by every climb of one stage search. */
export type SideMemo = Map<string, SideDesign | null>;

/**
 * True when the pair surely misses the swing target at the nominal corner. The swing is the contiguous interval
 * around the design point where the gain holds the target, so two outputs below and above the design point where
 * the gain is below the target (or the circuit cannot hold it), closer together than the swing target, prove a
 * miss. Tried where a miss shows first on a move from a design `near` meeting the targets: just outside one of its
 * swing edges and a swing target away from there. A few solves of the circuit the exact trace solves (stagePoint),
 * instead of a trace; undecided (false) when neither pair of outputs proves it.
 */
function surelyMisses(sides: StageSides, input: SideDesign, load: SideDesign, near: StageDesign): boolean {
  const { stage } = sides;
  const v0 = stage.output;
  const c = pairCircuit(sides, input, load);
  const p0 = rangeSafe(() => stagePoint(c, v0));
  if (!p0 || !(p0.gain >= stage.gain)) return true;
  // Gain at v (null: no solution from the design point's start, which proves nothing: the trace gets there by
  // continuation).
  const gainAt = (v: number): number | null => {
    if (!(v > 0 && v < sides.supply)) return null;
    const p = rangeSafe(() => stagePoint(c, v, p0.load, guessOf(p0.input)));
    return p ? p.gain : null;
  };
  const below = (v: number): boolean => {
    const g = gainAt(v);
    return g !== null && !(g >= stage.gain);
  };
  const { vlow, vhigh } = near.nominal.trace;
  if (vlow === null || vhigh === null) return false;
  const miss = (w: number, u: number): boolean => w < v0 && u > v0 && u - w < stage.swing && below(w) && below(u);
  if (miss(vlow - EDGE_GAP, vlow + stage.swing - 2 * EDGE_GAP) || miss(vhigh - stage.swing + 2 * EDGE_GAP, vhigh + EDGE_GAP)) return true;
  // Both edges moved: estimate each from the gain at the near design's edge and SECANT_STEP inside it (a secant on
  // the log of gain over target), and when the estimates are closer than the swing target, look just outside them.
  const edge = (e: number, inward: number): number | null => {
    const ga = gainAt(e);
    const gb = gainAt(e + inward * SECANT_STEP);
    if (ga === null || gb === null || !(ga > 0 && gb > 0)) return null;
    const la = Math.log(ga / stage.gain);
    const lb = Math.log(gb / stage.gain);
    if (!(la !== lb)) return null;
    const x = e + inward * SECANT_STEP * (la / (la - lb));
    return Number.isFinite(x) ? x : null;
  };
  const lo = edge(vlow, 1);
  const hi = lo === null ? null : edge(vhigh, -1);
  if (lo === null || hi === null || !(hi - lo < stage.swing)) return false;
  // Any pad below half the shortfall keeps the two outputs closer than the swing target; the widest such pad
  // best absorbs the secant's error.
  const pad = 0.45 * (stage.swing - (hi - lo));
  return miss(lo - pad, hi + pad);
}

/**
 * Local refinement of a gain stage: from the pair the pair screen picked and the seeds seedsOf adds from its pool,
 * hill-climb over moves judged exactly as one circuit (evaluatePair, every corner when it meets the nominal targets)
 * by stageBetter:
 * - one side moved with the other held: the stack climb's neighbours (each device's L to the neighbouring grid
 *   lengths, each gm/ID and VDS setpoint by ± its step), then pairs of those;
 * - then, at the screen's step, both sides at once, one single-coordinate move of each: a side giving up area and
 *   Rout only pays when the other makes up the gain, which no move of one side finds.
 * Moves go in order of summed area, so with objective area the first one meeting every target wins the round and
 * the rest, no smaller than it, are not traced; a move surelyMisses rules out is not traced either.
 * Every seed climbs at the screen's gm/ID step; the best of those climbs on with the steps halved twice. The screen
 * ranks pairs on estimated gain curves from a few hundred side candidates, so its pick can be far from the best
 * nearby design. Every design traced is added to `pool` (the trade front and the nearest points see them).
 */
export function refineStage(
  sides: StageSides, picked: StageDesign, pool: StageDesign[], memos: { input: SideMemo; load: SideMemo },
): { best: StageDesign; evaluated: number } {
  const { stage, supply } = sides;
  const vs = outputGrid(stage.output, supply, SIDE_STEP);
  const j0 = designIndex(vs, stage.output);
  const pairs = new Map<string, StageDesign | null>();
  let evaluated = 0;

  const sideOf = (side: Side, c: Candidate): SideDesign | null => {
    const memo = memos[side.kind];
    const key = candidateKey(c);
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

  const ok = climbOk(sides);
  const seeds = seedsOf(sides, picked, pool, ok);
  // Designs meeting every target that the climbs moved to (or started from): the result is the best of them that
  // the reported trace confirms.
  const met: StageDesign[] = [];
  let best = picked;
  let steps = { input: { g: 0, v: 0 }, load: { g: 0, v: 0 } };
  const bound = (): number => (stage.objective === 'area' && ok(best) ? best.area * (1 - REL_TOL) : Infinity);
  const sideMoves = (kind: 'input' | 'load', pairMoves: boolean): SideDesign[] => {
    const out: SideDesign[] = [];
    for (const c of neighbours(sides[kind].ctx, best[kind].cand, steps[kind].g, steps[kind].v, pairMoves)) {
      const d = sideOf(sides[kind], c);
      if (d) out.push(d);
    }
    return out;
  };
  type Move = { input: SideDesign; load: SideDesign; area: number };
  const move = (input: SideDesign, load: SideDesign): Move => ({ input, load, area: input.area + load.area });
  const movesOf = (kind: 'single' | 'pair' | 'cross'): Move[] => {
    const out: Move[] = [];
    if (kind === 'cross') {
      const loads = sideMoves('load', false);
      for (const i of sideMoves('input', false)) for (const l of loads) out.push(move(i, l));
    } else {
      for (const i of sideMoves('input', kind === 'pair')) out.push(move(i, best.load));
      for (const l of sideMoves('load', kind === 'pair')) out.push(move(best.input, l));
    }
    return out.sort((a, b) => a.area - b.area);
  };
  const tryMoves = (kind: 'single' | 'pair' | 'cross'): boolean => {
    let improved = false;
    for (const m of movesOf(kind)) {
      const limit = bound();
      // Sorted by area: once one is not below the bound (finite only with objective area), none after it is.
      if (!(m.area < limit)) break;
      // While the best meets every target only a move that does can replace it.
      if (limit < Infinity && surelyMisses(sides, m.input, m.load, best)) continue;
      const p = pairOf(m.input, m.load);
      if (p && stageBetter(sides, p, best, ok)) {
        best = p;
        if (ok(p)) met.push(p);
        improved = true;
      }
    }
    return improved;
  };
  const climb = (start: StageDesign, levels: number, scale: number): StageDesign => {
    best = start;
    steps = {
      input: { g: sides.input.ctx.gmidStep * scale, v: topologyOf(start.input.cand.topology).refineVoltageStep * scale },
      load: { g: sides.load.ctx.gmidStep * scale, v: topologyOf(start.load.cand.topology).refineVoltageStep * scale },
    };
    for (let round = 0, level = 1; round < MAX_ROUNDS; round++) {
      const improved = tryMoves('single') || tryMoves('pair') || (scale === 1 && tryMoves('cross'));
      if (improved) continue;
      if (++level > levels) break;
      for (const s of [steps.input, steps.load]) {
        s.g /= 2;
        s.v /= 2;
      }
    }
    return best;
  };

  let overall = picked;
  // Nothing the screen found meets the targets: one climb from the pick, at the screen's step (for the nearest
  // points, which are over the explored designs); the full refinement is for designs that meet them.
  for (const seed of seeds) if (ok(seed)) met.push(seed);
  const feasible = met.length > 0;
  for (const seed of feasible ? seeds : seeds.slice(0, 1)) {
    const local = climb(seed, 1, 1);
    if (local === overall || stageBetter(sides, local, overall, ok)) overall = local;
  }
  best = feasible ? climb(overall, 2, 0.5) : overall;
  if (!feasible) return { best, evaluated };
  // In objective order, the first the reported trace confirms (nearly always the climb's own best).
  met.sort((a, b) => stageCompare(stage.objective, a, b));
  return { best: met.find((d) => okReported(sides, d)) ?? best, evaluated };
}
