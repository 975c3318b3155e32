import type { StageSpec, Topology } from '../design/types.js';
import { topologyNames } from '../topology/index.js';
import { designIndex, outputGrid } from '../stack/index.js';
import type { KitAccess } from './kit.js';
import { inputAtTop, makeSide, roomCandidates, roomLeft, sideCandidates, sideDesign, spareRout, type SideDesign } from './stage-side.js';
import { screenPairs } from './stage-screen.js';
import { biasRealisable, evaluatePair, type StageDesign, type StageSides } from './stage-eval.js';
import { emptyStageResult, stageFrontPoint, stageResult } from './stage-result.js';
import { chooseStage } from './stage-choose.js';
import type { StageFrontPoint, StageResult } from './stage-types.js';
import { paretoStages } from './stage-front.js';
import { checkStageCover } from './table-cover.js';
import { refineStage, type SideMemo } from './stage-refine.js';
import { CandidateMap } from './search/candidate-map.js';
import type { Candidate } from './search/candidate.js';
import { fullyOkMemo, pickStage } from './stage-order.js';

/** Output grid step of the pair screen, V. */
const SCREEN_STEP = 0.05;
/**
 * Pairs of the top-gm/ID inputs' screen traced (its best by the objective come first): they only compete for the
 * climbs' other seeds, and tracing all of them cost ~2 % of the demo spec's instructions.
 */
const HIGH_TRACED = 3;
/** Inputs the loads screened with the room they leave are paired with: the leanest few (the room is theirs). */
const LEAN_INPUTS = 8;

export interface SizeStageResult {
  /** One result per load topology tried (`chosen` marks the objective's pick with 'auto'). */
  results: StageResult[];
  /** Trade front (gain, swing, area) over the exactly evaluated designs. */
  front: StageFrontPoint[];
  evaluated: number;
}

/** Side designs of one topology; `screened` false when the stack screen found no candidate at all (no room at the design point). */
function designs(sides: StageSides, side: StageSides['input'], topology: Topology, vs: Float64Array, j0: number, gmMax?: number): SideDesign[] & { screened?: boolean } {
  const out: SideDesign[] & { screened?: boolean } = [];
  side.narrowestTooWide = undefined; // this topology's own
  const cands = sideCandidates(sides.stage, side, topology, sides.supply);
  sizedInto(out, sides, side, cands, [], vs, j0, gmMax);
  // Screen again with all the headroom the side may have when the shares' candidates were all refused (a too-small
  // headroom share buys Rout with width beyond the width limit), or when a load has Rout to spare (spareRout).
  const refused = out.length === 0 && cands.length > 0 && side.narrowestTooWide !== undefined;
  if (refused || (side.kind === 'load' && spareRout(sides.stage, out, j0, gmMax ?? 0))) {
    sizedInto(out, sides, side, sideCandidates(sides.stage, side, topology, sides.supply, true), cands, vs, j0, gmMax);
  }
  out.screened = cands.length > 0;
  return out;
}

/**
 * The side designs of `cands` not among `known` onto `out`, those the tables cannot realise left out, and those whose
 * bias diodes cannot be (no pair with them can: in the pair screen they would only displace pairs that can).
 */
function sizedInto(
  out: SideDesign[], sides: StageSides, side: StageSides['input'], cands: readonly Candidate[], known: readonly Candidate[],
  vs: Float64Array, j0: number, gmMax?: number,
): void {
  const seen = new CandidateMap<true>();
  for (const c of known) seen.set(seen.key(c), true);
  for (const c of cands) {
    if (seen.has(seen.key(c))) continue;
    const d = sideDesign(side, c, vs, j0, sides.stage, sides.supply, gmMax);
    if (d && biasRealisable(sides, side, d)) out.push(d);
  }
}

/** The pairs traced exactly as one circuit each (those the tables cannot realise left out). */
function tracedPairs(sides: StageSides, pairs: readonly { input: SideDesign; load: SideDesign }[]): StageDesign[] {
  const out: StageDesign[] = [];
  for (const p of pairs) {
    const d = evaluatePair(sides, p.input, p.load);
    if (d) out.push(d);
  }
  return out;
}

/**
 * The LEAN_INPUTS input designs leaving the load the most room, beyond what its shares gave it (roomLeft), and the
 * most room any leaves.
 */
function leanInputs(sides: StageSides, inputs: readonly SideDesign[], vs: Float64Array, j0: number): { inputs: SideDesign[]; room?: number } {
  const out: Array<{ d: SideDesign; r: number }> = [];
  for (const d of inputs) {
    const r = roomLeft(sides.input, d, vs, j0, sides.stage, sides.supply);
    if (r !== undefined) out.push({ d, r });
  }
  out.sort((a, b) => b.r - a.r);
  return { inputs: out.slice(0, LEAN_INPUTS).map((x) => x.d), room: out[0]?.r };
}

/**
 * The input designs again with the input device at the top gm/ID, those not among `inputs` (and within the rails,
 * as they). Its gm sets the gain, so at the top the smallest pairs can have a shorter load; a screen ranking by area
 * never proposes it (a higher gm/ID only costs width), and in the pair screen with the others they push pairs out of
 * its pools (a pair screen of their own).
 */
function highInputs(sides: StageSides, inputs: readonly SideDesign[], vs: Float64Array, j0: number): SideDesign[] {
  const out: SideDesign[] = [];
  const cands = inputs.map((d) => inputAtTop(sides.input, d.cand));
  sizedInto(out, sides, sides.input, cands, inputs.map((d) => d.cand), vs, j0);
  return out.filter((d) => d.sized.gates[0] <= sides.supply);
}

/** Load designs from the room the leanest input leaves (roomCandidates), those already among `loads` left out. */
function roomLoads(sides: StageSides, topology: Topology, vs: Float64Array, j0: number, gmMax: number, room: number, loads: readonly SideDesign[]): SideDesign[] {
  const out: SideDesign[] = [];
  sizedInto(out, sides, sides.load, roomCandidates(sides.stage, sides.load, topology, sides.supply, room), loads.map((d) => d.cand), vs, j0, gmMax);
  return out;
}

/**
 * Size one gain stage: two stack searches coupled through the output node.
 * Each side is screened as a stack (the input side of the input type, the load
 * side of the other type for each load topology), sized at the design point
 * and traced on a coarse output grid; every pair is screened with the
 * estimated gain curve; the most promising pairs are traced exactly as one
 * circuit and checked at every corner.
 *
 * @example sizeStage(spec.stages[0], kit, { supply: 1.8, corners: ['tt'] }).results[0].predicted.swing
 */
export function sizeStage(stage: StageSpec, kit: KitAccess, opts: { supply: number; corners: string[] }): SizeStageResult {
  checkStageCover(stage, kit, opts.corners, opts.supply, `stage "${stage.name}".supply`);
  const input = makeSide(stage, 'input', kit, opts.supply, opts.corners);
  const load = makeSide(stage, 'load', kit, opts.supply, opts.corners);
  const sides: StageSides = { stage, supply: opts.supply, input, load };
  const vs = outputGrid(stage.output, opts.supply, SCREEN_STEP);
  const j0 = designIndex(vs, stage.output);
  const sized = designs(sides, input, stage.input.topology, vs, j0);
  // The input gate (gates[0], from the input rail) must sit within the rails; others only when nothing else exists.
  const within = sized.filter((d) => d.sized.gates[0] <= opts.supply);
  const inputs = within.length > 0 ? within : sized;
  const gmMax = Math.max(0, ...inputs.map((d) => Math.max(...(d.gm as Float64Array))));
  const lean = leanInputs(sides, inputs, vs, j0);
  const high = highInputs(sides, inputs, vs, j0);
  const topologies: readonly Topology[] = stage.load.topology === 'auto' ? topologyNames() : [stage.load.topology];
  const results: StageResult[] = [];
  const explored: StageFrontPoint[] = [];
  // Side designs the climbs build, by candidate key, shared by the load topologies' climbs.
  const memos: { input: SideMemo; load: SideMemo } = { input: new CandidateMap(), load: new CandidateMap() };
  let evaluated = 0;
  for (const t of topologies) {
    const before = input.ctx.count.exact + load.ctx.count.exact + input.ctx.count.screened + load.ctx.count.screened;
    const loads = designs(sides, load, t, vs, j0, gmMax);
    const { pairs, screened } = screenPairs(stage, inputs, loads, vs, j0);
    // The loads the leanest inputs' room gives, paired with those inputs in a pair screen of their own: in one screen
    // their estimated curves could push the other pairs out of its pools.
    const roomy = lean.room === undefined ? [] : roomLoads(sides, t, vs, j0, gmMax, lean.room, loads);
    const more = roomy.length > 0 ? screenPairs(stage, lean.inputs, roomy, vs, j0) : { pairs: [], screened: 0 };
    const pool = tracedPairs(sides, pairs);
    // Likewise the inputs at the top gm/ID (highInputs), with the loads of the pairs traced (the screen's choice
    // of loads for the gain; with every load this screen cost as much as the others).
    const poolLoads = [...new Set(pool.map((d) => d.load))];
    const higher = high.length > 0 ? screenPairs(stage, high, poolLoads, vs, j0) : { pairs: [], screened: 0 };
    const roomPool = tracedPairs(sides, more.pairs);
    const highPool = tracedPairs(sides, higher.pairs.slice(0, HIGH_TRACED));
    const traced = pool.length + roomPool.length + highPool.length;
    // One memo of "meets every target at every corner" for the pick and the climbs (corners are traced on demand).
    const ok = fullyOkMemo(sides);
    // The room's best pair is climbed from besides the others' seeds, which it must not displace: a climb from a
    // smaller pick can settle on a larger design than the one it displaced. The top gm/ID's pairs only compete for
    // the climbs' other seeds (seedsOf; a climb more cost ~9 % of the demo spec's instructions).
    const roomPick = pickStage(sides, roomPool, ok);
    const picked = pickStage(sides, pool, ok) ?? roomPick ?? pickStage(sides, highPool, ok);
    const climb = picked ? refineStage(sides, picked, pool, memos, ok, roomPick && roomPick !== picked ? [roomPick] : [], highPool.filter((d) => d.area < picked.area && ok(d))) : undefined;
    pool.push(...roomPool, ...highPool);
    const count = input.ctx.count.exact + load.ctx.count.exact + input.ctx.count.screened + load.ctx.count.screened - before + screened + more.screened + higher.screened + traced + (climb?.evaluated ?? 0);
    evaluated += count;
    if (!climb) {
      // No candidate of a side at all: its lower devices cannot be saturated in the room the design point leaves
      // (the tables were never the obstacle); else no pair could be realised from the tables.
      const why = sized.screened === false || loads.screened === false ? 'saturation' : 'table';
      // Every design of a side refused by the width limit: that binds (required the limit, achieved the narrowest).
      const wide = sized.length === 0 ? input : loads.length === 0 ? load : undefined;
      const width = wide?.narrowestTooWide !== undefined ? { wmax: wide.ctx.wmax, narrowest: wide.narrowestTooWide } : undefined;
      results.push(emptyStageResult(sides, t, count, width ? 'width' : why, width));
      continue;
    }
    results.push(stageResult(sides, climb.best, pool, count, climb.nearest));
    for (const d of pool) explored.push(stageFrontPoint(sides, d));
  }
  if (stage.load.topology === 'auto') {
    const pick = chooseStage(results, stage);
    for (const r of results) r.chosen = r === pick;
  }
  return { results, front: paretoStages(explored), evaluated };
}

/** Size every stage of a spec: results (one per load topology each) and a trade front per stage name. */
export function sizeStages(stages: readonly StageSpec[], kit: KitAccess, opts: { supply: number; corners: string[] }): { stages: StageResult[]; stageFronts: Record<string, StageFrontPoint[]> } {
  const out: StageResult[] = [];
  const stageFronts: Record<string, StageFrontPoint[]> = {};
  for (const s of stages) {
    const r = sizeStage(s, kit, opts);
    out.push(...r.results);
    stageFronts[s.name] = r.front;
  }
  return { stages: out, stageFronts };
}
