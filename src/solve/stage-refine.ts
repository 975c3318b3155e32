import { topologyOf } from '../topology/index.js';
import { REL_TOL } from '../policy.js';
import { nearestSample, sampleOf, stageGain, stagePoint, SWING_TOLERANCE, type StageCircuit, type StagePoint, type StageSample, type StageTrace } from '../stack/index.js';
import { vinMargin } from './stage-rails.js';
import { coordinates, perCoordinate, SETPOINT_MIN, type Candidate } from './search/candidate.js';
import { ridgeStepOver, withCoordinate, type RidgeFigures, type RidgePoint } from './search/ridge.js';
import type { CandidateMap } from './search/candidate-map.js';
import { neighbours } from './search/refine.js';
import { sideChecked, sideSized, type Side, type SideDesign, type SideSized } from './stage-side.js';
import { SEARCH_STEP, TRACE_STEP, evaluateCorner, evaluatePair, pairCircuit, setFine, stageAt, type PairJudge, type StageDesign, type StageSides } from './stage-eval.js';
import { meets, stageCompare, stageMargins, withinRails } from './stage-rank.js';
import { fullyOkMemo, stageBetter } from './stage-order.js';
import { rangeSafe } from './evaluate/evaluate.js';

/** Span of surelyMisses' secant at a swing edge, V. */
const SECANT_STEP = 0.01;
/** How far outside a swing edge surelyMisses looks, V (below the traces' 0.5 mV edge resolution). */
const EDGE_GAP = 1e-4;
/** Designs the climbs start from, per load topology (two pass the exhaustive-reference tests; each more costs a climb). */
const SEEDS = 2;
/** The nearest points' climbs start at this multiple of the screen's steps and halve them NEAREST_LEVELS − 1 times (4, 2, 1, 0.5). */
const NEAREST_SCALE = 4;
const NEAREST_LEVELS = 4;
/** Setpoint moves, in steps, tried together with a length move (and a gm/ID step) once the other moves are exhausted. */
const SETPOINT_JUMPS = [-4, -2];
/**
 * Setpoint moves, in steps, tried together with a device's gm/ID a step lower once the other moves are exhausted: a
 * higher setpoint costs no area and widens the swing, which a lower gm/ID (less area) then spends; on a swing-bound
 * ridge neither move alone beats the climb's best.
 */
const TRADE_JUMPS = [2, 4, 8];
/** Ridge steps at most after the climbs; their difference steps (a multiple of the screen's gm/ID and refine voltage steps) and box (in those steps). */
const RIDGE_STEPS = 8;
const RIDGE_SCALE = 0.25;
const RIDGE_BOX = 4;
/**
 * Corrections of a ridge try that lost the swing margin (see ridgeStepOver): on a swing-bound ridge the margin left
 * is often a hair, which the curvature takes from every linearised step.
 */
const RIDGE_CORRECTIONS = 3;
/** Climb rounds at most; each round tries the moves of both sides once. */
const MAX_ROUNDS = 24;

/**
 * Meets every target at every corner on the reported grid (as the result will be traced). The first design that
 * does is the result: it keeps those traces (setFine), which the result would trace again.
 */
function okReported(sides: StageSides, d: StageDesign): boolean {
  const n = stageAt(sides, d.nominal.corner, d.nominal.circuit, d.nominal.gates, TRACE_STEP);
  if (!meets(stageMargins(sides.stage, n))) return false;
  const corners: NonNullable<StageDesign['corners']> = [];
  for (const c of sides.input.ctx.corners.slice(1)) {
    const at = evaluateCorner(sides, d, c, TRACE_STEP);
    if (!meets(stageMargins(sides.stage, at))) return false;
    corners.push(at);
  }
  setFine(d, n, corners);
  return true;
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

/** The candidates one device length away from `from` (device k to the neighbouring table length), nothing else moved. */
function lengthMoves(ctx: { lengths: readonly number[] }, from: Candidate): Array<{ cand: Candidate; k: number }> {
  const out: Array<{ cand: Candidate; k: number }> = [];
  for (let k = 0; k < from.l.length; k++) {
    let j = 0;
    for (let i = 1; i < ctx.lengths.length; i++) if (Math.abs(ctx.lengths[i] - from.l[k]) < Math.abs(ctx.lengths[j] - from.l[k])) j = i;
    for (const dj of [-1, 1]) {
      const l = ctx.lengths[j + dj];
      if (l === undefined) continue;
      out.push({ cand: { topology: from.topology, l: from.l.map((x, i) => (i === k ? l : x)), gmid: [...from.gmid], setpoints: [...from.setpoints] }, k });
    }
  }
  return out;
}

/**
 * A side candidate a climb moves to: sized, and checked at the design point (sideChecked) only once a move to it is
 * tried, as a move is tried only while its summed area beats the climb's bound (`design` undefined: not yet).
 */
interface SideMove {
  sized: SideSized;
  design: SideDesign | null | undefined;
  area: number;
}

/** Side moves of one side by candidate key (null: not realisable), shared by every climb of one stage search. */
export type SideMemo = CandidateMap<SideMove | null>;

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
  // The pair's design point, solved only when a check needs it: most moves are proven by the pair of outputs at
  // the near design's swing edge alone.
  let p0: StagePoint | null | undefined;
  const design = (): StagePoint | null => (p0 === undefined ? (p0 = rangeSafe(() => stagePoint(c, v0))) : p0);
  const short = (): boolean => {
    const p = design();
    return !p || !(p.gain >= stage.gain);
  };
  const { vlow, vhigh, points, j0 } = near.nominal.trace;
  // Newton starts from the near design's solution (a move changes one side by a step) at its kept sample nearest the
  // output solved: the design point's, or the last grid point inside a swing edge (see stageAt).
  const start = points[j0] ?? design();
  if (!start || vlow === null || vhigh === null) return short();
  const guess = sampleOf(start);
  const gainAt = (v: number): number | null => gainFrom(sides, c, near.nominal.trace, guess, v);
  const below = (v: number): boolean => {
    const g = gainAt(v);
    return g !== null && !(g >= stage.gain);
  };
  const miss = (w: number, u: number): boolean => w < v0 && u > v0 && u - w < stage.swing && below(w) && below(u);
  if (miss(vlow - EDGE_GAP, vlow + stage.swing - 2 * EDGE_GAP) || miss(vhigh - stage.swing + 2 * EDGE_GAP, vhigh + EDGE_GAP)) return true;
  if (short()) return true;
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
 * Gain of circuit `c` at output `v`, Newton from the kept sample of `near` (a trace of a design a step away) nearest
 * v, else from `guess` (null: no solution from there, which proves nothing: a trace gets there by continuation);
 * only the gain is read, so nothing of the input side's solution is allocated (stageGain).
 */
function gainFrom(sides: StageSides, c: StageCircuit, near: StageTrace, guess: StageSample, v: number): number | null {
  if (!(v > 0 && v < sides.supply)) return null;
  const q = nearestSample(near, v) ?? guess;
  return rangeSafe(() => stageGain(c, v, q.load, q));
}

/** An order of stage designs for a climb: true when `a` is better than `b`. */
export type StageOrder = (a: StageDesign, b: StageDesign) => boolean;

interface ClimbOptions {
  better: StageOrder;
  /** Step halvings after the first level (1: the given step only). */
  levels: number;
  /** Step scale: 1 is the screen's gm/ID step and the topology's refine voltage step. */
  scale: number;
  /** Lowest summed area a move must beat (Infinity: none), and whether surelyMisses may skip moves below it. */
  bound: (best: StageDesign) => number;
  /** Called with every design a move reaches that beats the climb's best. */
  onBetter?: (d: StageDesign) => void;
  /** True when a pair surely cannot beat the climb's best: it is not traced (the caller answers for the pool). */
  hopeless?: Hopeless;
  /** A device length every move keeps (see shorterClimbs). */
  hold?: { kind: 'input' | 'load'; k: number; l: number };
}

/** A pair of side designs that surely cannot beat a climb's best. */
type Hopeless = (input: SideDesign, load: SideDesign, best: StageDesign) => boolean;

/**
 * Climbs over stage designs with the side designs and pairs it builds memoised (shared by every climb of one load
 * topology; side designs also across topologies through `memos`), pairs judged as `judge` says (see evaluatePair).
 * Every pair traced is added to `pool`.
 */
function stageClimber(sides: StageSides, pool: StageDesign[], memos: { input: SideMemo; load: SideMemo }, judge: PairJudge = 'search') {
  const { supply } = sides;
  // Pairs by their sides' keys in `memos` (input, then load).
  const pairs = new Map<number, Map<number, StageDesign | null>>();
  let evaluated = 0;

  const sideOf = (side: Side, c: Candidate): SideMove | null => {
    const memo = memos[side.kind];
    const key = memo.key(c);
    let d = memo.get(key);
    if (d === undefined) {
      // sideSized refuses a device wider than the width limit; the input gate must also sit within the rails
      // (as the search's input designs).
      const sized = sideSized(side, c);
      d = sized && !(side.kind === 'input' && !(sized.sized.gates[0] <= supply)) ? { sized, design: undefined, area: sized.area } : null;
      memo.set(key, d);
    }
    return d;
  };
  const designOf = (side: Side, m: SideMove): SideDesign | null => (m.design === undefined ? (m.design = sideChecked(side, m.sized)) : m.design);
  // Pairs by their side designs' identity (a move's sides come from the memos), before the key is built; and the
  // pairs surelyMisses proved short of the swing: both settle a move again without a solve.
  const known = new Map<SideDesign, Map<SideDesign, StageDesign | null>>();
  const missed = new Map<SideDesign, Set<SideDesign>>();
  const pairOf = (input: SideDesign, load: SideDesign): StageDesign | null => {
    let byLoad = known.get(input);
    let d = byLoad?.get(load);
    if (d !== undefined) return d;
    const ki = memos.input.key(input.cand);
    let byLoadKey = pairs.get(ki);
    if (!byLoadKey) pairs.set(ki, (byLoadKey = new Map()));
    const kl = memos.load.key(load.cand);
    d = byLoadKey.get(kl);
    if (d === undefined) {
      d = evaluatePair(sides, input, load, judge);
      evaluated++;
      if (d && judge !== 'point') pool.push(d);
      byLoadKey.set(kl, d);
    }
    if (!byLoad) known.set(input, (byLoad = new Map()));
    byLoad.set(load, d);
    return d;
  };
  // True when the pair was traced already, or surelyMisses proves (or once proved) it misses the swing.
  const skipped = (input: SideDesign, load: SideDesign, near: StageDesign): boolean => {
    if (known.get(input)?.has(load)) return false;
    let loads = missed.get(input);
    if (loads?.has(load)) return true;
    if (!surelyMisses(sides, input, load, near)) return false;
    if (!loads) missed.set(input, (loads = new Set()));
    loads.add(load);
    return true;
  };

  // The side designs of two candidates (null: a side not realisable, or not saturated at the design point).
  const sidesAt = (ci: Candidate, cl: Candidate): { input: SideDesign; load: SideDesign } | null => {
    const mi = sideOf(sides.input, ci);
    const ml = mi && sideOf(sides.load, cl);
    const input = mi && ml && designOf(sides.input, mi);
    const load = input && designOf(sides.load, ml!);
    return input && load ? { input, load } : null;
  };
  const pairAt = (ci: Candidate, cl: Candidate): StageDesign | null => {
    const q = sidesAt(ci, cl);
    return q && pairOf(q.input, q.load);
  };

  type Steps = { input: { g: number; v: number }; load: { g: number; v: number } };
  type Move = { input: SideMove; load: SideMove; area: number };
  // A side's moves depend only on its design and the steps, and a round that moves one side finds the other's
  // again: each list is built once (the same SideMove objects in the same order), by side design and steps.
  const lists = new WeakMap<SideDesign, Map<string, SideMove[]>>();
  const listed = (d: SideDesign, key: string, build: () => SideMove[]): SideMove[] => {
    let byKey = lists.get(d);
    if (!byKey) lists.set(d, (byKey = new Map()));
    let out = byKey.get(key);
    if (!out) byKey.set(key, (out = build()));
    return out;
  };
  const sideMoves = (best: StageDesign, steps: Steps, kind: 'input' | 'load', pairMoves: boolean): SideMove[] =>
    listed(best[kind], `${steps[kind].g}|${steps[kind].v}|${pairMoves}`, () => {
      const out: SideMove[] = [];
      for (const c of neighbours(sides[kind].ctx, best[kind].cand, steps[kind].g, steps[kind].v, pairMoves)) {
        const d = sideOf(sides[kind], c);
        if (d) out.push(d);
      }
      return out;
    });
  // Coupled length moves: a device's L to the neighbouring table length together with its gm/ID by a step, with one
  // setpoint several steps lower (SETPOINT_JUMPS), or both. A shorter device loses Rout near the swing edges, which
  // a higher gm/ID (more gain) or a lower setpoint (more room for the device above) makes up; no single or pair
  // move of the climb finds such a move, and on a thin feasible region the climb stopped short of it. Also the
  // trades (tradesOf).
  const jumpMoves = (best: StageDesign, steps: Steps, kind: 'input' | 'load'): SideMove[] =>
    listed(best[kind], `${steps[kind].g}|${steps[kind].v}|jump`, () => [...jumpsOf(best[kind].cand, steps[kind], kind), ...tradesOf(best[kind].cand, steps[kind], kind)]);
  const jumpsOf = (from: Candidate, step: { g: number; v: number }, kind: 'input' | 'load'): SideMove[] => {
    const out: SideMove[] = [];
    const ctx = sides[kind].ctx;
    const [gLo, gHi] = [ctx.gmids[0], ctx.gmids[ctx.gmids.length - 1]];
    for (const { cand: c, k } of lengthMoves(ctx, from)) {
      for (const gs of [0, -1, 1]) {
        const g = c.gmid[k] + gs * step.g;
        if (!(g >= gLo - 1e-9 && g <= gHi + 1e-9)) continue;
        const gmid = c.gmid.map((x, i) => (i === k ? g : x));
        // The moved device's gm/ID by a step (the plain length move is the single moves' own), then with one
        // setpoint jump each.
        if (gs !== 0) {
          const d = sideOf(sides[kind], { topology: c.topology, l: c.l, gmid, setpoints: c.setpoints });
          if (d) out.push(d);
        }
        setpointJumps({ topology: c.topology, l: c.l, gmid, setpoints: c.setpoints }, SETPOINT_JUMPS, step.v, kind, out);
      }
    }
    return out;
  };
  // Trades: a device's gm/ID a step lower (less area, less swing) with one setpoint several steps higher (TRADE_JUMPS).
  const tradesOf = (from: Candidate, step: { g: number; v: number }, kind: 'input' | 'load'): SideMove[] => {
    const out: SideMove[] = [];
    const gLo = sides[kind].ctx.gmids[0];
    for (let k = 0; k < from.gmid.length; k++) {
      const g = from.gmid[k] - step.g;
      if (!(g >= gLo - 1e-9)) continue;
      setpointJumps({ topology: from.topology, l: from.l, gmid: from.gmid.map((x, i) => (i === k ? g : x)), setpoints: from.setpoints }, TRADE_JUMPS, step.v, kind, out);
    }
    return out;
  };
  // `c` with one setpoint moved by each of `jumps` steps of `vstep` (those left at SETPOINT_MIN or more), onto `out`.
  const setpointJumps = (c: Candidate, jumps: readonly number[], vstep: number, kind: 'input' | 'load', out: SideMove[]): void => {
    for (let j = 0; j < c.setpoints.length; j++) {
      for (const n of jumps) {
        const v = c.setpoints[j] + n * vstep;
        if (!(v >= SETPOINT_MIN)) continue;
        const d = sideOf(sides[kind], { topology: c.topology, l: c.l, gmid: c.gmid, setpoints: c.setpoints.map((x, i) => (i === j ? v : x)) });
        if (d) out.push(d);
      }
    }
  };
  const movesOf = (best: StageDesign, steps: Steps, kind: 'single' | 'pair' | 'cross' | 'jump'): Move[] => {
    const out: Move[] = [];
    const move = (input: SideMove, load: SideMove): Move => ({ input, load, area: input.area + load.area });
    // The side a move holds.
    const held = { input: { sized: best.input, design: best.input, area: best.input.area }, load: { sized: best.load, design: best.load, area: best.load.area } };
    if (kind === 'jump') {
      for (const i of jumpMoves(best, steps, 'input')) out.push(move(i, held.load));
      for (const l of jumpMoves(best, steps, 'load')) out.push(move(held.input, l));
    } else if (kind === 'cross') {
      const loads = sideMoves(best, steps, 'load', false);
      for (const i of sideMoves(best, steps, 'input', false)) for (const l of loads) out.push(move(i, l));
    } else {
      for (const i of sideMoves(best, steps, 'input', kind === 'pair')) out.push(move(i, held.load));
      for (const l of sideMoves(best, steps, 'load', kind === 'pair')) out.push(move(held.input, l));
    }
    return out.sort((a, b) => a.area - b.area);
  };

  const climb = (start: StageDesign, o: ClimbOptions): StageDesign => {
    let best = start;
    const steps: Steps = {
      input: { g: sides.input.ctx.gmidStep * o.scale, v: topologyOf(start.input.cand.topology).refineVoltageStep * o.scale },
      load: { g: sides.load.ctx.gmidStep * o.scale, v: topologyOf(start.load.cand.topology).refineVoltageStep * o.scale },
    };
    const tryMoves = (kind: 'single' | 'pair' | 'cross' | 'jump'): boolean => {
      let improved = false;
      for (const m of movesOf(best, steps, kind)) {
        const limit = o.bound(best);
        // Sorted by area: once one is not below the bound, none after it is.
        if (!(m.area < limit)) break;
        if (o.hold && m[o.hold.kind].sized.cand.l[o.hold.k] !== o.hold.l) continue;
        const input = designOf(sides.input, m.input);
        const load = input && designOf(sides.load, m.load);
        if (!input || !load) continue;
        // While the bound is finite (the best meets every target) only a move that does can replace it.
        if (limit < Infinity && skipped(input, load, best)) continue;
        if (o.hopeless && !known.get(input)?.has(load) && o.hopeless(input, load, best)) continue;
        const p = pairOf(input, load);
        if (p && o.better(p, best)) {
          best = p;
          o.onBetter?.(p);
          improved = true;
        }
      }
      return improved;
    };
    for (let round = 0, level = 1; round < MAX_ROUNDS; round++) {
      // The jumps only once the other moves are exhausted at the last step size: they extend a climb, not steer it.
      const improved = tryMoves('single') || tryMoves('pair') || (o.scale <= 1 && tryMoves('cross')) || (level === o.levels && tryMoves('jump'));
      if (improved) continue;
      if (++level > o.levels) break;
      for (const s of [steps.input, steps.load]) {
        s.g /= 2;
        s.v /= 2;
      }
    }
    return best;
  };
  // One ridge step (search/ridge.ts) over both sides' continuous coordinates (input's, then the load's), objective
  // ln area, margins the nominal swing and input DC voltage (see stageMargins; a gbw target is left to the tries'
  // judging): where the climb stops on a swing-bound ridge that only three or more coordinates moved at once in the
  // right proportions leave (a device's gm/ID up for swing, another's down for area, a setpoint up), which no single,
  // pair or cross move makes. The differences are taken of estimates, a few solves each instead of a trace: each
  // swing edge moves by the move's change of ln gain there over the slope of ln gain in the output at that edge
  // (first order, as the differences themselves). A try surelyMisses rules out is not traced.
  const ridge = (best: StageDesign, better: StageOrder): StageDesign | null => {
    const { stage } = sides;
    const { trace, circuit } = best.nominal;
    const start = trace.points[trace.j0];
    if (trace.vlow === null || trace.vhigh === null || !start) return null;
    const guess = sampleOf(start);
    const edges: { v: number; ln: number; slope: number }[] = [];
    for (const [v, inward] of [[trace.vlow, 1], [trace.vhigh, -1]]) {
      const g0 = gainFrom(sides, circuit, trace, guess, v);
      const g1 = gainFrom(sides, circuit, trace, guess, v + inward * SECANT_STEP);
      if (!(g0 !== null && g1 !== null && g0 > 0 && g1 > 0 && g0 !== g1)) return null;
      edges.push({ v, ln: Math.log(g0), slope: (Math.log(g1) - Math.log(g0)) / (inward * SECANT_STEP) });
    }
    const cands = [best.input.cand, best.load.cand];
    const split = coordinates(cands[0]).length;
    const pairAt = (x: ArrayLike<number>, moved: readonly number[]): { input: SideDesign; load: SideDesign } | null => {
      let [ci, cl] = cands;
      for (const k of moved) {
        if (k < split) ci = withCoordinate(ci, k, x[k]);
        else cl = withCoordinate(cl, k - split, x[k]);
      }
      return sidesAt(ci, cl);
    };
    const marginsOf = (d: StageDesign): number[] => {
      const m = stageMargins(stage, d.nominal);
      return [m.swing, m.vin];
    };
    const at = (x: ArrayLike<number>, moved: readonly number[]): RidgePoint<StageDesign> | null => {
      const q = pairAt(x, moved);
      const d = q && !skipped(q.input, q.load, best) ? pairOf(q.input, q.load) : null;
      const m = d && marginsOf(d);
      return d && m!.every(Number.isFinite) ? { design: d, f: Math.log(d.area), m: m! } : null;
    };
    const slopesAt = (x: ArrayLike<number>, moved: readonly number[]): RidgeFigures | null => {
      const q = pairAt(x, moved);
      if (!q) return null;
      const c = pairCircuit(sides, q.input, q.load);
      let swing = 0;
      for (const [j, e] of edges.entries()) {
        const g = gainFrom(sides, c, trace, guess, e.v);
        if (g === null || !(g > 0)) return null;
        swing += (j === 0 ? -1 : 1) * (e.v - (Math.log(g) - e.ln) / e.slope);
      }
      const p = rangeSafe(() => stagePoint(c, stage.output, guess.load, guess));
      if (!p) return null;
      return { f: Math.log(q.input.area + q.load.area), m: [(swing - stage.swing) / stage.swing, vinMargin(p.vin, sides.supply)] };
    };
    // One value per coordinate of both sides, from each side's context and candidate.
    const perSide = (gmid: (ctx: Side['ctx']) => number, setpoint: (c: Candidate) => number): number[] =>
      cands.flatMap((c, s) => perCoordinate(c, gmid((s === 0 ? sides.input : sides.load).ctx), setpoint(c)));
    const h = perSide((ctx) => ctx.gmidStep * RIDGE_SCALE, (c) => topologyOf(c.topology).refineVoltageStep * RIDGE_SCALE);
    const lo = perSide((ctx) => ctx.gmids[0], () => SETPOINT_MIN);
    const hi = perSide((ctx) => ctx.gmids[ctx.gmids.length - 1], () => Infinity);
    const x = cands.flatMap(coordinates);
    return ridgeStepOver({ design: best, f: Math.log(best.area), m: marginsOf(best) }, x, h, RIDGE_BOX, RIDGE_BOX / 4, lo, hi, at, better, slopesAt, RIDGE_CORRECTIONS)?.next ?? null;
  };
  return { climb, ridge, pairOf, pairAt, evaluated: () => evaluated };
}
type Climber = ReturnType<typeof stageClimber>;

/**
 * Climbs from `from` with one device a table length shorter, each holding that length (else its first move is
 * straight back to `from`). A shorter device is the main way to less area, but from a design on the targets' edge
 * it often meets them again only with several other coordinates moved far (another device longer, gm/IDs and a
 * setpoint retuned), which no move of a climb makes at once.
 */
function shorterClimbs(sides: StageSides, climber: Climber, from: StageDesign, o: ClimbOptions): StageDesign[] {
  const out: StageDesign[] = [];
  for (const kind of ['input', 'load'] as const) {
    for (const { cand, k } of lengthMoves(sides[kind].ctx, from[kind].cand)) {
      if (!(cand.l[k] < from[kind].cand.l[k])) continue;
      const seed = kind === 'input' ? climber.pairAt(cand, from.load.cand) : climber.pairAt(from.input.cand, cand);
      if (seed) out.push(climber.climb(seed, { ...o, hold: { kind, k, l: cand.l[k] } }));
    }
  }
  return out;
}

/**
 * Local refinement of a gain stage: from the pair the pair screen picked, the seeds seedsOf adds from its pool (and
 * from `rivals`, not in `pool`), and `also` (designs from another pair screen, not in `pool`),
 * hill-climb over moves judged exactly as one circuit (evaluatePair, every corner when it meets the nominal targets)
 * by stageBetter:
 * - one side moved with the other held: the stack climb's neighbours (each device's L to the neighbouring grid
 *   lengths, each gm/ID and VDS setpoint by ± its step), then pairs of those;
 * - then, at the screen's step and the halved ones (not in the nearest points' coarser climbs), both sides at once,
 *   one single-coordinate move of each: a side giving up area and Rout only pays when the other makes up the gain,
 *   which no move of one side finds;
 * - then, at a climb's finest step only, coupled length moves of one side (jumpMoves);
 * - with objective area, once the climbs have stopped: ridge steps over both sides' gm/IDs and setpoints at once
 *   (stageClimber's ridge), then the finest climb again when they moved.
 * Moves go in order of summed area, so with objective area the first one meeting every target wins the round and
 * the rest, no smaller than it, are not traced; a move surelyMisses rules out is not traced either.
 * Every seed climbs at the screen's gm/ID step (only the pick when no seed meets the targets, and then, should it
 * reach them, also the shorterClimbs from where it did); the best of those, and each other meeting the targets,
 * climbs on with the steps halved twice. The screen ranks pairs on estimated gain curves from a few hundred side candidates, so its
 * pick can be far from the best nearby design. Every design traced is added to `pool` (the trade front and the
 * nearest points see them).
 * When nothing meets the targets, the nearest points are climbed for too (nearestStage).
 */
export function refineStage(
  sides: StageSides, picked: StageDesign, pool: StageDesign[], memos: { input: SideMemo; load: SideMemo },
  ok: (d: StageDesign) => boolean = fullyOkMemo(sides), also: readonly StageDesign[] = [], rivals: readonly StageDesign[] = [],
): { best: StageDesign; evaluated: number; nearest?: StageNearest } {
  const { stage } = sides;
  const climber = stageClimber(sides, pool, memos);
  const better: StageOrder = (a, b) => stageBetter(sides, a, b, ok);
  const seeds = [...seedsOf(sides, picked, [...pool, ...rivals], ok), ...also];
  // Designs meeting every target that the climbs moved to (or started from): the result is the best of them that
  // the reported trace confirms.
  const met: StageDesign[] = [];
  const bound = (best: StageDesign): number => (stage.objective === 'area' && ok(best) ? best.area * (1 - REL_TOL) : Infinity);
  const onBetter = (p: StageDesign) => {
    if (ok(p)) met.push(p);
  };
  let overall = picked;
  const locals: StageDesign[] = [];
  for (const seed of seeds) if (ok(seed)) met.push(seed);
  const seedsMet = met.length > 0;
  // Nothing the screen found meets the targets: one climb from the pick at the screen's step, then the climbs for
  // the nearest points; the full refinement is for designs that meet them (should one of those climbs reach one).
  const start = { better, levels: 1, scale: 1, bound, onBetter };
  for (const seed of seedsMet ? seeds : seeds.slice(0, 1)) {
    const local = climber.climb(seed, start);
    locals.push(local);
    if (local === overall || better(local, overall)) overall = local;
  }
  // That one climb chose its lengths on its way to the targets, not by area: where it met them, each device a length
  // shorter seeds a climb of its own.
  if (!seedsMet && ok(overall)) {
    for (const local of shorterClimbs(sides, climber, overall, start)) {
      locals.push(local);
      if (better(local, overall)) overall = local;
    }
  }
  if (met.length === 0) {
    const { nearest, evaluated } = nearestStage(sides, pool, memos, climber);
    for (const d of pool) if (ok(d)) met.push(d);
    if (met.length === 0) return { best: overall, evaluated: climber.evaluated() + evaluated, nearest };
    for (const d of met) if (better(d, overall)) overall = d;
  }
  // Every seed's climb meeting the targets goes on at the finer steps, not only the best: a basin behind at the
  // screen's step can hold the better design at a finer one.
  let best = climber.climb(overall, { better, levels: 2, scale: 0.5, bound, onBetter });
  for (const local of new Set(locals)) {
    if (local === overall || !ok(local)) continue;
    const fine = climber.climb(local, { better, levels: 2, scale: 0.5, bound, onBetter });
    if (better(fine, best)) best = fine;
  }
  // With objective area, where the climbs stop: ridge steps, then a climb at the finest steps from where they went.
  let moved = false;
  for (let it = 0; stage.objective === 'area' && it < RIDGE_STEPS && ok(best); it++) {
    const r = climber.ridge(best, better);
    if (!r) break;
    onBetter(r);
    best = r;
    moved = true;
  }
  if (moved) best = climber.climb(best, { better, levels: 1, scale: RIDGE_SCALE, bound, onBetter });
  // In objective order, the first the reported trace confirms (nearly always the climb's own best).
  met.sort((a, b) => stageCompare(stage.objective, a, b));
  return { best: met.find((d) => okReported(sides, d)) ?? best, evaluated: climber.evaluated() };
}

/** The designs reaching a stage's nearest points (nominal corner, input DC voltage within the rails). */
export interface StageNearest {
  /** Highest gain at the design point. */
  peak: StageDesign;
  /** Highest gain held over the swing target. */
  held: StageDesign;
  /** Widest swing at the gain target (undefined when no design reaches the gain target at the design point). */
  swing?: StageDesign;
  /** With a gbw target, when some design meets gain and swing: the highest GBW among those. */
  gbw?: StageDesign;
  /** With several corners: gain held and swing at the gain target with each design judged at its worst corner. */
  overCorners?: { gainAtSwing: number; swingAtGain: number };
}

/** An order putting designs with the input DC voltage within the rails first, then by `key` (higher first), then `tie`. */
function higher(sides: StageSides, key: (d: StageDesign) => number, tie: (d: StageDesign) => number): StageOrder {
  return (a, b) => {
    const ra = withinRails(sides.stage, a);
    if (ra !== withinRails(sides.stage, b)) return ra;
    const ka = key(a);
    const kb = key(b);
    if (ka !== kb) return ka > kb;
    return tie(a) > tie(b);
  };
}

/**
 * The nearest points of a stage nothing met the targets with, over the whole allowed design space rather than the
 * designs the search happened to trace: for each question (peak gain at the design point; gain held over the swing
 * target; swing at the gain target; with a gbw target, the highest GBW meeting gain and swing) a climb by that
 * figure from the two best traced designs, with one side's single and pair moves (the both-sides moves are for the
 * refinement's area climb), the steps from NEAREST_SCALE times the screen's halved down to half of the screen's.
 */
function nearestStage(sides: StageSides, pool: StageDesign[], memos: { input: SideMemo; load: SideMemo }, search: Climber): { nearest?: StageNearest; evaluated: number } {
  const { stage } = sides;
  // The gain at the design point needs one solve of the circuit; the swing (its edges bisected on the circuit) is
  // what the search grid's traces give; the gain held over the swing needs its window ends solved on the circuit:
  // read off the search grid by linear interpolation it can come out at half its value where the gain falls
  // steeply at the ends.
  const point = stageClimber(sides, pool, memos, 'point');
  const held = stageClimber(sides, pool, memos, 'held');
  // The two best traced designs by an order.
  const leaders = (better: StageOrder): StageDesign[] =>
    pool.filter((d) => withinRails(sides.stage, d)).sort((a, b) => (better(a, b) ? -1 : better(b, a) ? 1 : 0)).slice(0, 2);
  // The leaders' climbs and those from extra seeds, skipping a seed on the same lengths as an earlier one: a climb
  // settles gm/ID and setpoints near its seed, so what another seed adds is mostly other lengths.
  const lengthsOf = (d: StageDesign) => `${d.input.cand.l.join(',')}/${d.load.cand.l.join(',')}`;
  const top = (climber: Climber, better: StageOrder, extra: readonly (StageDesign | undefined)[] = [], hopeless?: Hopeless): StageDesign | undefined => {
    const first = leaders(better);
    const taken = new Set(first.map(lengthsOf));
    const seeds = [...first];
    for (const d of extra) {
      if (!d || taken.has(lengthsOf(d))) continue;
      taken.add(lengthsOf(d));
      seeds.push(d);
    }
    return climbFrom(climber, better, seeds, hopeless);
  };
  const gain = (d: StageDesign) => d.nominal.gain;
  const evaluated = () => point.evaluated() + held.evaluated();
  const peakOrder = higher(sides, gain, () => 0);
  const peakAt = top(point, peakOrder);
  const peak = peakAt && search.pairOf(peakAt.input, peakAt.load);
  if (!peak) return { evaluated: evaluated() };
  // The held gain and the swing at the gain target are two views of one trade: each climb also starts from the
  // other's winner (and the held gain from the peak), since the traced designs the other seeds come from depend on
  // the targets the area search aimed at, and a climb from them can stop on a local best.
  const heldOrder = higher(sides, (d) => d.nominal.gainAtSwing, gain);
  const swingOrder = higher(sides, (d) => d.nominal.trace.swing, gain);
  let heldBy = top(held, heldOrder, [peak], heldHopeless(sides, peak, point)) ?? peak;
  const swing = peak.nominal.gain >= stage.gain ? top(search, swingOrder, [heldBy]) : undefined;
  // The swing climb's winner on lengths of its own: the held gain climbs from it too.
  if (swing && !leaders(heldOrder).concat(heldBy).some((d) => lengthsOf(d) === lengthsOf(swing))) {
    const local = climbFrom(held, heldOrder, [swing]);
    if (local && heldOrder(local, heldBy)) heldBy = local;
  }
  const swingMet = (d: StageDesign) => (d.nominal.trace.swing >= stage.swing - SWING_TOLERANCE ? 1 : 0);
  const gbwOrder: StageOrder = (a, b) => swingMet(a) !== swingMet(b) ? swingMet(a) > swingMet(b) : higher(sides, (d) => d.nominal.gbw ?? 0, gain)(a, b);
  const gbw = stage.gbw !== undefined && swing && swingMet(swing)
    ? top(search, gbwOrder)
    : undefined;
  // Over every corner (before the nominal winners are re-traced below: the climbs compare on the search grid).
  const overCorners = sides.input.ctx.corners.length > 1 ? stageOverCorners(sides, pool, { held, search }, [peak, heldBy, swing], leaders, heldOrder, swingOrder) : undefined;
  // The figures the report shows: on the reported grid.
  for (const d of new Set([peak, heldBy, swing, gbw])) if (d) d.nominal = stageAt(sides, d.nominal.corner, d.nominal.circuit, d.nominal.gates, TRACE_STEP);
  return { nearest: { peak, held: heldBy, swing, gbw, overCorners }, evaluated: evaluated() };
}

/** Relative slack on the held gain's bound where heldGain's one window can end at the design point (solved there again). */
const HELD_SLACK = 1e-6;

/**
 * The held-gain climb's sure skip. The gain held over the swing target is at most the gain at the design point
 * (heldGain's windows hold the design point as a grid sample), which one solve gives (the point climber's,
 * memoised): a move below the best's held gain there, and not within the rails where the best is not, cannot beat
 * it by the held order. An untraced move is missing from the pool, which counts only where the pool is read: the
 * swing climb (run when the peak reaches the gain target) and the climbs over corners seed from its leaders. So the
 * skip is for one corner and a peak short of the gain target, and for moves short of it at the design point (swing
 * 0: off the trade front, meeting nothing).
 */
function heldHopeless(sides: StageSides, peak: StageDesign, point: Climber): Hopeless | undefined {
  const { stage } = sides;
  if (peak.nominal.gain >= stage.gain || sides.input.ctx.corners.length > 1) return undefined;
  return (input, load, best) => {
    const q = point.pairOf(input, load);
    if (!q || q.nominal.trace.points[0] === null) return false;
    const g = q.nominal.gain;
    return g < stage.gain && g * (1 + HELD_SLACK) < best.nominal.gainAtSwing && (withinRails(stage, best) || !withinRails(stage, q));
  };
}

/** The best of the nearest points' climbs (by `better`) from these traced designs. */
function climbFrom(climber: Climber, better: StageOrder, seeds: readonly StageDesign[], hopeless?: Hopeless): StageDesign | undefined {
  let best: StageDesign | undefined;
  for (const traced of seeds) {
    const seed = climber.pairOf(traced.input, traced.load);
    if (!seed) continue;
    const local = climber.climb(seed, { better, levels: NEAREST_LEVELS, scale: NEAREST_SCALE, bound: () => Infinity, hopeless });
    if (!best || better(local, best)) best = local;
  }
  return best;
}

/** A stage design at its worst corner: input DC voltage within the rails at every corner, lowest held gain and swing. */
interface WorstStage {
  rails: boolean;
  held: number;
  swing: number;
}

function worstStage(sides: StageSides, d: StageDesign, step: number): WorstStage {
  let rails = withinRails(sides.stage, d);
  let held = d.nominal.gainAtSwing;
  let swing = d.nominal.trace.swing;
  for (const c of sides.input.ctx.corners.slice(1)) {
    // The held gain's window ends solved on the circuit, as the nominal climb's ('held' judge).
    const at = evaluateCorner(sides, d, c, step, true);
    if ('error' in at) return { rails: false, held: 0, swing: 0 };
    rails &&= stageMargins(sides.stage, at).vin >= 0;
    held = Math.min(held, at.gainAtSwing);
    swing = Math.min(swing, at.trace.swing);
  }
  return { rails, held, swing };
}

/**
 * The nearest points over every corner: each design (sized at the nominal corner, gates from its bias diodes at each
 * corner) judged at its worst corner, climbed for from the nominal winners and leaders. A design's worst figure is at
 * most its nominal one, so a move already behind the climb's best at the nominal corner is passed over without
 * tracing its other corners. The winners' figures are traced on the reported grid.
 */
function stageOverCorners(
  sides: StageSides, pool: StageDesign[], climbers: { held: Climber; search: Climber },
  nominal: ReadonlyArray<StageDesign | undefined>, leaders: (o: StageOrder) => StageDesign[], heldOrder: StageOrder, swingOrder: StageOrder,
): { gainAtSwing: number; swingAtGain: number } {
  const memo = new WeakMap<StageDesign, WorstStage>();
  const worst = (d: StageDesign): WorstStage => {
    let w = memo.get(d);
    if (!w) memo.set(d, (w = worstStage(sides, d, SEARCH_STEP)));
    return w;
  };
  const by = (key: (d: StageDesign) => number, nominalKey: (d: StageDesign) => number): StageOrder => (a, b) => {
    const wb = worst(b);
    if (wb.rails && !(nominalKey(a) >= key(b))) return false;
    const wa = worst(a);
    if (wa.rails !== wb.rails) return wa.rails;
    if (key(a) !== key(b)) return key(a) > key(b);
    return a.area < b.area;
  };
  const heldAll = by((d) => worst(d).held, (d) => d.nominal.gainAtSwing);
  const swingAll = by((d) => worst(d).swing, (d) => d.nominal.trace.swing);
  const starts = [...new Set([...nominal, ...leaders(heldOrder), ...leaders(swingOrder)])].filter((d): d is StageDesign => d !== undefined);
  const top2 = (o: StageOrder) => [...starts].sort((a, b) => (o(a, b) ? -1 : o(b, a) ? 1 : 0)).slice(0, 2);
  const held = climbFrom(climbers.held, heldAll, top2(heldAll));
  const swing = climbFrom(climbers.search, swingAll, top2(swingAll));
  // Reported figures: every corner re-traced on the reported grid.
  const fine = (d: StageDesign | undefined): WorstStage | undefined => {
    if (!d) return undefined;
    const n = stageAt(sides, d.nominal.corner, d.nominal.circuit, d.nominal.gates, TRACE_STEP);
    return worstStage(sides, { ...d, nominal: n }, TRACE_STEP);
  };
  const h = fine(held);
  const s = fine(swing);
  return { gainAtSwing: h?.rails ? h.held : 0, swingAtGain: s?.rails ? s.swing : 0 };
}
