import { StackwrightError } from '../errors.js';
import { resolveCorners } from '../design/index.js';
import type { DesignSpec, StackSpec, Topology } from '../design/types.js';
import { topologyNames, topologyOf } from '../topology/index.js';
import { CAUTION, type SizeResult, type StackResult } from './types.js';
import { distanceToFeasible } from '../policy.js';
import type { KitAccess } from './kit.js';
import { checkStageCover, checkTableCover } from './table-cover.js';
import { makeContext, type SolveContext } from './context.js';
import { screen } from './search/screen.js';
import { CLIMB_ROUNDS, evaluateOnce, evaluateToPool, refine, settle, tradedClimb, type Seen } from './search/refine.js';
import { reuseOf, type Reuse } from './search/reuse.js';
import { CandidateMap } from './search/candidate-map.js';
import type { Candidate } from './search/candidate.js';
import { evaluateCandidate, finalize, fullyOk, nominalOk, type Evaluated } from './evaluate/evaluate.js';
import { better, compareDesigns, pickBest, shortfall } from './search/rank.js';
import { emptyResult, stackResult } from './result.js';
import { nearestPoints } from './nearest.js';
import { chooseResult } from './choose.js';
import { paretoFront, type FrontPoint } from './pareto.js';
import { verdict, type Verdict } from './evaluate/verdict.js';
import { sizeStages } from './stage-size.js';
import { bottomRoom, diodeRoomCandidates, narrowestDesign, bottomsTooNarrow } from './search/diode-room.js';
import { setpointRoomCandidates } from './search/setpoint-room.js';
import { fromSetpointLine } from './search/setpoint-line.js';
import { alongValley } from './search/valley.js';
import { fromOtherSide } from './search/setpoint-side.js';
import { fromWidest } from './search/widest-probe.js';
import { fromSlackJump } from './search/setpoint-jump.js';
import { liftedOffSaturationEdge } from './search/saturation-lift.js';
import type { StageFrontPoint } from './stage-types.js';
import { toWidthLimit, widestAt } from './search/width-edge.js';

export interface SizeStackResult {
  results: StackResult[];
  front: FrontPoint[];
  /** Candidates evaluated: screened combinations plus exact evaluations. */
  evaluated: number;
}

function frontPoint(ctx: SolveContext, e: Evaluated): FrontPoint {
  return {
    topology: e.cand.topology,
    headroom: e.nominal.headroom,
    rout: e.nominal.rout,
    area: e.area,
    feasible: nominalOk(e) && (e.corners === undefined ? ctx.corners.length === 1 : fullyOk(ctx, e)),
    devices: e.nominal.mid.devices.map((b, k) => ({ l: e.cand.l[k], gmid: b.gm / b.id, w: e.sized.w[k] })),
    setpoints: [...e.cand.setpoints],
  };
}

// Shortfall (policy.distanceToFeasible, nominal corner) within which a start biased another way gets a climb: 4 is
// 200 mV of headroom; the starts the demo specs give miss by 600 mV and more, and no climb brings them back.
const REACH = 4;

// Climbs per search: the best design and the best of other length choices (the optimum's lengths may differ). As many
// when the screen's best misses the targets (its estimates misled there, and the nearest length choices often climb
// into the same basin): the NEAREST by shortfall, and beyond them those within the climb's reach (REACH, as for the
// starts biased another way). The meet-only searches of the width bisection, repeated at several limits, take NEAREST.
const SEEDS = 4;
const NEAREST = 2;
// Shortfall (policy.distanceToFeasible) within which a design missing the targets still seeds a climb when the best
// meets them: a few mV of headroom or a few % of Rout, which a climb of a few steps makes up.
const NEAR_MISS = 0.5;

/** e starts within reach of best by the objective: 30 % of area or Rout, 30 mV of headroom. */
function near(objective: StackSpec['objective'], e: Evaluated, best: Evaluated): boolean {
  if (objective === 'area') return e.area <= 1.3 * best.area;
  if (objective === 'rout') return e.nominal.rout >= best.nominal.rout / 1.3;
  return e.nominal.headroom <= best.nominal.headroom + 0.03;
}

/**
 * Seeds for refinement: the best design and the best of each other length
 * choice of the same kind (meeting targets and starting near the best, or
 * nearest to meeting them).
 */
function seedsOf(ctx: SolveContext, best: Evaluated, pool: readonly Evaluated[], reach = REACH): Evaluated[] {
  const ok = fullyOk(ctx, best);
  // Without a design meeting every corner, seed from those nearest to it over all corners (designs meeting
  // the nominal targets but missing at another corner included: they are often the nearest).
  const rest = pool
    .filter((e) => e !== best && (ok ? nominalOk(e) : true))
    .sort((a, b) => (ok ? compareDesigns(ctx.spec.objective, a, b) : shortfall(ctx, a) - shortfall(ctx, b)));
  const lengths = (e: Evaluated) => e.cand.l.join(',');
  const taken = new Set([lengths(best)]);
  const seeds = [best];
  // e as a seed when its length choice has none yet.
  const takeLengths = (e: Evaluated): void => {
    if (taken.has(lengths(e))) return;
    taken.add(lengths(e));
    seeds.push(e);
  };
  for (const e of rest) {
    if (seeds.length >= (ok || !ctx.meetOnly ? SEEDS : NEAREST)) break;
    if (ok && !near(ctx.spec.objective, e, best)) break;
    if (!ok && seeds.length >= NEAREST && distanceToFeasible(e.margins) > reach) continue;
    takeLengths(e);
  }
  // Seeds to spare after every near length choice: near designs of a length choice already taken at other setpoints.
  // Designs of one length choice can lie in separate basins along the setpoints (audit3 A3-15: a triple's bottom at
  // its saturation edge at 0.2 V with a low gm/ID, or at 0.15 V with a high one, 7 % more Rout), and one climb
  // reaches only one. Only where the length choices leave seeds to spare, so it costs nothing where they do not.
  const basin = (e: Evaluated) => `${lengths(e)}|${e.cand.setpoints.join(',')}`;
  const basins = new Set(seeds.map(basin));
  for (const e of rest) {
    if (!ok || seeds.length >= SEEDS || !near(ctx.spec.objective, e, best)) break;
    if (basins.has(basin(e))) continue;
    basins.add(basin(e));
    seeds.push(e);
  }
  // Seeds to spare still: the nearest design of each other length choice that misses the nominal targets by little
  // (NEAR_MISS) and beats the best by the objective. The screen's estimates misjudge a target by a few mV, and where
  // only one length choice meets them, every other one's designs fall just short (random audit seed 20261322 #7: the
  // bottom at 500 nm and the top at 180 nm 0.1 mV above the headroom target, the climb from there 37 % smaller than the
  // one from the only design meeting it). Only where the designs meeting the targets leave seeds to spare, and not in the
  // meet-only searches (any design meeting the targets answers them).
  if (ok && !ctx.meetOnly && seeds.length < SEEDS) {
    const missing = pool
      .filter((e) => !nominalOk(e) && distanceToFeasible(e.margins) <= NEAR_MISS && compareDesigns(ctx.spec.objective, e, best) < 0)
      .sort((a, b) => distanceToFeasible(a.margins) - distanceToFeasible(b.margins));
    for (const e of missing) {
      if (seeds.length >= SEEDS) break;
      takeLengths(e);
    }
  }
  // Short of the targets with every other design of the same lengths (a pool of a few designs: the screen's candidates
  // mostly not realisable): still the NEAREST, the next ones whatever their lengths. Designs of one length choice can
  // lie in separate basins (the targets met on islands a few mV wide), and one climb reaches only one.
  for (const e of rest) {
    if (ok || seeds.length >= NEAREST) break;
    if (!seeds.includes(e)) seeds.push(e);
  }
  return seeds;
}

// Setpoint steps of the fallback below, V, and the lowest setpoint it tries (the setpoint grid's start).
const LOWER_STEP = 0.025;
const LOWEST_SETPOINT = 0.05;

/**
 * When no screened candidate can be realised, the same candidates with their VDS setpoints lowered step by step:
 * the screen does not size the bias diodes, and a cascode gate voltage too high for the bias current leaves every
 * length of its diode narrower than the minimum width (a lower setpoint lowers the gate voltage, so the diode
 * widens). Only runs when the pool is otherwise empty, so it adds no work where the screen's candidates are realised.
 */
function lowered(ctx: SolveContext, cands: readonly Candidate[], seen: Seen, pool: Evaluated[]): void {
  for (const c of cands) {
    for (let d = LOWER_STEP; ; d += LOWER_STEP) {
      const setpoints = c.setpoints.map((s) => Math.round((s - d) * 1e6) / 1e6);
      if (setpoints.length === 0 || setpoints.some((s) => s < LOWEST_SETPOINT - 1e-9)) break;
      const e = evaluateOnce(ctx, { topology: c.topology, l: c.l, gmid: c.gmid, setpoints }, seen);
      if (e) {
        pool.push(e);
        break;
      }
    }
  }
}

/**
 * With objective Rout, the length choices of which no screened design meets the targets: each one's nearest design with
 * every device raised to the width limit (widestAt), evaluated when new; those meeting the targets within reach of
 * `best` (near) come back as more seeds. Rout rises with gm/ID into weak inversion, so a length choice's best design can
 * sit on the width limit between the gm/ID grid's points, the grid point below missing a target (audit3 A3-2: both
 * devices at 400 nm and 26.5 /V, 14 % above the answer; the screen's 25.1 /V missed the headroom target).
 *
 * When `best` misses the targets too (no screened design meets them: all far wider than the limit), the same for every
 * length choice, its setpoints raised by LOWER_STEP until realised (the lower gm/ID the limit leaves can put a lower
 * device's VDSsat above the screen's setpoint), and the SEEDS nearest to the targets within the climb's reach come back.
 * The climbs from the screen's best designs pulled to the limit settle on the length choices the screen preferred far
 * from the limit (random audit seed 20261383 #26: a demo180 p triple, every screened design far wider than the limit,
 * all with a 1.4 µm bottom; their climbs' answer 336 MΩ, the reference's 375 MΩ; with these seeds 364 MΩ, all three
 * devices at 1.4 µm).
 */
function widestOfShortLengths(ctx: SolveContext, best: Evaluated, pool: Evaluated[], seen: Seen): Evaluated[] {
  if (ctx.meetOnly || ctx.spec.objective !== 'rout') return [];
  const ok = fullyOk(ctx, best);
  const nearest = new Map<string, Evaluated>();
  const met = new Set<string>();
  for (const e of pool) {
    const k = e.cand.l.join(',');
    if (nominalOk(e)) met.add(k);
    const n = nearest.get(k);
    if (!n || distanceToFeasible(e.margins) < distanceToFeasible(n.margins)) nearest.set(k, e);
  }
  const out: Evaluated[] = [];
  for (const [k, e] of nearest) {
    const c = met.has(k) ? null : widestAt(ctx, e.cand);
    if (!c || seen.has(seen.key(c))) continue;
    if (ok) {
      const w = evaluateToPool(ctx, c, seen, pool);
      if (w && fullyOk(ctx, w) && near('rout', w, best)) out.push(w);
      continue;
    }
    const w = raisedUntilRealised(ctx, c, seen);
    if (!w || out.includes(w)) continue;
    if (!pool.includes(w)) pool.push(w);
    if (distanceToFeasible(w.margins) <= REACH) out.push(w);
  }
  if (ok) return out;
  return out.sort((a, b) => distanceToFeasible(a.margins) - distanceToFeasible(b.margins)).slice(0, SEEDS);
}

/**
 * A seed wider than the width limit pulled back to it (toWidthLimit), its setpoints then raised by LOWER_STEP until it
 * is realised: at the lower gm/ID the limit leaves, a lower device's VDSsat can lie above the seed's setpoint, and the
 * climb's moves, one step at a time, do not get there from the too-wide seed. Null when the seed fits already or
 * nothing is realised.
 */
function pulledToWidth(ctx: SolveContext, c: Candidate, seen: Seen): Evaluated | null {
  const fits = toWidthLimit(ctx, c);
  if (!fits || fits === c) return null;
  return raisedUntilRealised(ctx, fits, seen);
}

/** `fits` with its setpoints raised by LOWER_STEP until it is realised (below mid-span); null when it never is. */
function raisedUntilRealised(ctx: SolveContext, fits: Candidate, seen: Seen): Evaluated | null {
  for (let d = 0; fits.setpoints.every((s) => s + d < ctx.vmid); d += LOWER_STEP) {
    const e = evaluateOnce(ctx, { topology: fits.topology, l: fits.l, gmid: fits.gmid, setpoints: fits.setpoints.map((s) => Math.round((s + d) * 1e6) / 1e6) }, seen);
    if (e || fits.setpoints.length === 0) return e;
  }
  return null;
}

/** Screen, evaluate, refine: the best design and everything evaluated, or null when nothing could be realised. */
function search(ctx: SolveContext, topology: Topology): { best: Evaluated; pool: Evaluated[]; seen: Seen } | null {
  const seen: Seen = new CandidateMap();
  const pool: Evaluated[] = [];
  const screened = screen(ctx, topology);
  for (const c of screened) {
    const e = evaluateOnce(ctx, c, seen);
    if (e) pool.push(e);
  }
  if (pool.length === 0) lowered(ctx, screened, seen, pool);
  // An empty screen says nothing about the allowed space: a stacked bias's diodes with less room than the screen
  // leaves, or between its grid points at the width limit, may still make designs (only runs when it is empty).
  if (screened.length === 0) {
    for (const c of [...diodeRoomCandidates(ctx, topology), ...setpointRoomCandidates(ctx, topology)]) {
      const e = evaluateOnce(ctx, c, seen);
      if (e) pool.push(e);
    }
  }
  const first = pickBest(ctx, pool);
  if (!first) return null;
  const seeds = seedsOf(ctx, first, pool);
  // More climbs from each seed biased the ways the screen cannot rate (the topology's otherBias), each one that starts
  // within the climb's reach of the nominal targets. When too wide, also pulled back to the width limit: a long bottom
  // at a high setpoint carries the Rout target at a lower gm/ID, far below the seed's (audit2 #2119: 22.6 -> 15.6 /V).
  for (const from of [...seeds]) {
    // Not in the meet-only searches of the nearest points' width bisection: each would pull every too-wide seed again.
    const pulled = ctx.meetOnly ? null : pulledToWidth(ctx, from.cand, seen);
    if (pulled) {
      pool.push(pulled);
      if (distanceToFeasible(pulled.margins) <= REACH) seeds.push(pulled);
    }
    for (const other of topologyOf(topology).otherBias(from.cand, ctx.vmid, ctx.gmids[0])) {
      const fits = toWidthLimit(ctx, other);
      for (const c of fits && fits !== other ? [other, fits] : [other]) {
        const biased = evaluateOnce(ctx, c, seen);
        if (!biased) continue;
        pool.push(biased);
        if (distanceToFeasible(biased.margins) <= REACH) seeds.push(biased);
        // Beyond reach with a lower device at its saturation edge: that setpoint lifted a step or two instead.
        const lifted = liftedOffSaturationEdge(ctx, biased, seen, REACH);
        if (lifted && !seeds.includes(lifted)) {
          pool.push(lifted);
          seeds.push(lifted);
        }
      }
    }
  }
  for (const e of widestOfShortLengths(ctx, first, pool, seen)) seeds.push(e);
  let best = refine(ctx, seeds, seen, pool) ?? first;
  // Short of the targets, the seeds climbed again from twice the steps: Rout and headroom can vary in narrow valleys
  // along a setpoint (a few mV wide, a couple of steps apart: the headroom where the bottom leaves saturation first,
  // and again where the top does), and a climb from the screen's grid settles in the nearest, short of a target met
  // in the next. Only for searches that meet nothing, so it costs nothing where the first climbs succeed; not in the
  // meet-only searches of the nearest points' width bisection, which repeat the search at several limits. With them, the
  // nearest designs of the length choices beyond the climb's reach: the nearer ones' climbs have failed.
  if (!ctx.meetOnly && !fullyOk(ctx, best)) {
    const far = seedsOf(ctx, first, pool, Infinity).filter((e) => !seeds.includes(e));
    const coarse = refine(ctx, [...seeds, ...far], seen, pool, undefined, undefined, CLIMB_ROUNDS, 2);
    if (coarse && better(ctx, coarse, best)) best = coarse;
  }
  best = fromWidest(ctx, best, seen, pool);
  best = fromOtherSide(ctx, first, best, seen, pool);
  best = fromSetpointLine(ctx, best, seen, pool);
  best = alongValley(ctx, best, seen, pool);
  best = fromSlackJump(ctx, best, seen, pool);
  best = tradedClimb(ctx, best, seen, pool);
  // The report uses the full curve; if that loses a target the scan met, take the next best.
  for (let tries = 0; tries < 5 && !finalize(ctx, best); tries++) {
    settle(ctx, seen, pool);
    best = pickBest(ctx, pool) ?? best;
  }
  finalize(ctx, best);
  return { best, pool, seen };
}

function sizeTopology(ctx: SolveContext, topology: Topology): { result: StackResult; pool: Evaluated[] } {
  const before = ctx.count.screened + ctx.count.exact;
  const rejected = { triode: ctx.count.triode, narrow: ctx.count.narrow };
  const run = search(ctx, topology);
  const counted = () => ctx.count.screened + ctx.count.exact - before;
  const nearOf = (r: NonNullable<typeof run>) => () => {
    // The bisection's searches share their evaluations with each other and with this one.
    const reuse = reuseOf(r.seen);
    return nearestPoints(ctx, topology, r.pool, r.seen, (w) => fitsWithin(ctx, topology, w, reuse));
  };
  if (run) return { result: stackResult(ctx, run.best, run.pool, counted, nearOf(run), (e) => refine(ctx, [e], run.seen, run.pool) ?? e), pool: run.pool };
  // Nothing with saturated lower devices on the screen's grid: search again with them allowed, so refinement
  // can still reach a saturated design or, failing that, show the nearest one failing on saturation.
  // Only saturated designs go on the front.
  // The relaxed context shares the counters, slices and sweeps; only the saturation rule differs.
  const near = search({ ...ctx, saturation: 'report' }, topology);
  if (near) return { result: stackResult(ctx, near.best, near.pool, counted, nearOf(near)), pool: near.pool.filter((e) => e.margins.saturation >= 0) };
  return { result: emptyResult(ctx, topology, counted(), noCandidate(ctx, topology, rejected)), pool: [] };
}

/**
 * A design meeting every nominal target within a width limit of `w`, judged again under the spec's own limit (so its
 * margins and corners are the ones reported), or null when the search finds none.
 */
function fitsWithin(ctx: SolveContext, topology: Topology, w: number, reuse?: Reuse): Evaluated | null {
  const limited: SolveContext = { ...ctx, wmax: w, spec: { ...ctx.spec, wmax: w }, reuse, meetOnly: true };
  const run = search(limited, topology);
  if (!run || !nominalOk(run.best)) return null;
  const e = evaluateCandidate(ctx, run.best.cand);
  if (e) finalize(ctx, e);
  return e;
}

/** Why a topology got no design at all, from the rejections counted since `from`. */
function noCandidate(ctx: SolveContext, topology: Topology, from: { triode: number; narrow: number }): Verdict {
  // A stacked bias whose every allowed bottom diode has VGS at or above mid-span leaves its top device no room: the
  // allowed space holds no design of the topology at all (achieved: the most VDS any of them leaves the top).
  const room = bottomRoom(ctx, topology);
  if (room !== null && room <= 0) return verdict('saturation', undefined, room, ctx.vmid, ctx.nominal, 'top');
  // No bottom diode within the width limit, and none wider leaves room either: no width helps.
  const anyWidth = room === null ? bottomRoom(ctx, topology, Infinity) : null;
  if (anyWidth !== null && anyWidth <= 0) return verdict('saturation', undefined, anyWidth, ctx.vmid, ctx.nominal, 'top');
  // Designs exist only wider than the limit (a top with room above a bottom diode): the width limit binds, not the
  // table (achieved: the narrowest limit with a design; at: mid-span, where the room is taken).
  const needs = narrowestDesign(ctx, topology);
  if (needs !== null && needs > ctx.wmax) return verdict('width', ctx.wmax, needs, ctx.vmid, ctx.nominal);
  if (bottomsTooNarrow(ctx, topology)) return verdict('width', ctx.wmin, undefined, undefined, ctx.nominal);
  const triode = ctx.count.triode - from.triode;
  const narrow = ctx.count.narrow - from.narrow;
  // No lower device saturated (VDSsat ≥ 4·UT at any inversion level) below the headroom target.
  if (triode > 0) return verdict('saturation', 4 * ctx.ut(ctx.nominal), undefined, ctx.spec.headroom, ctx.nominal);
  if (narrow > 0) return verdict('width', ctx.wmin, undefined, undefined, ctx.nominal);
  return verdict('table', undefined, undefined, ctx.vmid, ctx.nominal);
}

/**
 * Size one current source/sink: for its topology (or each of the four for
 * 'auto') screen the design space cheaply, evaluate the most promising few
 * hundred exactly, refine locally, and check every corner. Returns one result
 * per topology tried and, per topology, the Pareto front of its exactly evaluated designs.
 *
 * @example sizeStack(spec, kit, { supply: 1.8, corners: ['tt', 'ss'] }).results[0].feasible
 */
export function sizeStack(spec: StackSpec, kit: KitAccess, opts: { supply: number; corners: string[] }): SizeStackResult {
  checkTableCover(spec, kit, opts.corners, opts.supply, `stack "${spec.name}"`);
  const ctx = makeContext(spec, kit, opts.supply, opts.corners);
  const topologies: readonly Topology[] = spec.topology === 'auto' ? topologyNames() : [spec.topology];
  const results: StackResult[] = [];
  const front: FrontPoint[] = [];
  for (const t of topologies) {
    const { result, pool } = sizeTopology(ctx, t);
    results.push(result);
    // Each topology's own front: the overall front is contained in their union, and every
    // topology tried (the chosen one above all) keeps its points even where another dominates it.
    front.push(...paretoFront(pool.map((e) => frontPoint(ctx, e))));
  }
  return { results, front, evaluated: ctx.count.screened + ctx.count.exact };
}

/**
 * Size every stack of a design spec on the kit, over the spec's corners
 * (resolved against the kit: default nominal, "all" for every corner). With
 * topology 'auto' each topology gets a result and the chosen one has `chosen: true`.
 */
/**
 * The whole-spec checks made before any search (kit, corners, table cover of every stack and stage), so a spec
 * the tables cannot describe fails first. Returns the resolved corners. Shared by sizeDesign and sizeSpecParallel.
 */
export function checkDesign(design: DesignSpec, kit: KitAccess): string[] {
  if (design.kit !== kit.kit) {
    throw new StackwrightError(`spec asks for kit "${design.kit}" but the tables are for "${kit.kit}"`, { where: `${design.file}: kit` });
  }
  const corners = resolveCorners(design, kit.corners);
  design.stacks.forEach((s, i) => checkTableCover(s, kit, corners, design.supply, `${design.file}: stacks[${i}]`));
  (design.stages ?? []).forEach((s, i) => checkStageCover(s, kit, corners, design.supply, `${design.file}: supply`, `${design.file}: stages[${i}]`));
  return corners;
}

export function sizeDesign(design: DesignSpec, kit: KitAccess): SizeResult & { fronts: Record<string, FrontPoint[]>; stageFronts?: Record<string, StageFrontPoint[]> } {
  const corners = checkDesign(design, kit);
  const stacks: StackResult[] = [];
  const fronts: Record<string, FrontPoint[]> = {};
  for (const s of design.stacks) {
    const r = sizeStack(s, kit, { supply: design.supply, corners });
    if (s.topology === 'auto') {
      // The one the objective prefers (or the nearest when none is feasible) is marked; the rest are alternatives.
      const pick = chooseResult(r.results, s);
      for (const x of r.results) x.chosen = x === pick;
    }
    stacks.push(...r.results);
    fronts[s.name] = r.front;
  }
  const out: ReturnType<typeof sizeDesign> = { kit: kit.kit, corners, supply: design.supply, caution: CAUTION, stacks, fronts };
  if (design.stages?.length) Object.assign(out, sizeStages(design.stages, kit, { supply: design.supply, corners }));
  return out;
}

/** A size run: the result as `size --json` prints it, and the Pareto front per stack name. */
export interface SizeRun {
  result: SizeResult;
  fronts: Record<string, FrontPoint[]>;
  /** Trade front (gain, swing, area) per stage name, when the spec has stages. */
  stageFronts?: Record<string, StageFrontPoint[]>;
}

/** sizeDesign with the fronts kept beside the result. */
export function sizeSpec(spec: DesignSpec, kit: KitAccess): SizeRun {
  const { fronts, stageFronts, ...result } = sizeDesign(spec, kit);
  return stageFronts ? { result, fronts, stageFronts } : { result, fronts };
}
