import type { Topology } from '../design/types.js';
import type { SolveContext } from './context.js';
import { ensureCorners, finalize, type Evaluated, type Start } from './evaluate/evaluate.js';
import { CLIMB_ROUNDS, defer, evaluateOnce, lookOnce, refine, settle, type Hopeless, type Seen } from './search/refine.js';
import { routSurelyBelow, routSurelyBelowAt, scanPointAtOrAbove, type Look } from './search/quick.js';
import { screen } from './search/screen.js';
import type { Candidate } from './search/candidate.js';
import { lineProbes } from './search/line-probes.js';
import { widthRoomCandidates } from './search/width-room.js';
import { nearestAlongSetpoints } from './search/setpoint-line.js';

/** The nearest reachable points of an infeasible stack, over the whole allowed design space. */
export interface Nearest {
  /** Lowest headroom at which the Rout target (and the current window) holds up to span, V; Infinity when never. */
  headroomAtRout: number;
  /** Highest lowest-Rout over [target headroom, span], Ω (0 when the table covers no design there). */
  routAtHeadroom: number;
  /** The designs that reach them (evaluated on the full curve), when usable ones exist. */
  atRout?: Evaluated;
  atHeadroom?: Evaluated;
  /** When every design meeting Rout and headroom breaks the width limit: the narrowest widest device among them, m. */
  narrowest?: number;
  /** The design with that widest device (every target met but the width limit). */
  atWidth?: Evaluated;
  /** With several corners: the same two questions with each design judged at its worst corner (see overCorners). */
  overCorners?: OverCorners;
}

/** Nearest points over every corner of the run: each design (sized at the nominal corner) at its worst corner. */
export interface OverCorners {
  /** Lowest headroom at which the Rout target and current window hold up to span at every corner, V; Infinity when never. */
  headroomAtRout: number;
  /** Highest lowest-Rout over [target headroom, span] that every corner keeps, Ω (0 when none). */
  routAtHeadroom: number;
}

// Meets everything but the width limit.
const physical = (e: Evaluated) => e.margins.rout >= 0 && e.margins.headroom >= 0 && e.margins.mismatch >= 0 && e.margins.iout >= 0 && e.margins.saturation >= 0;
const widestOf = (e: Evaluated) => Math.max(...e.sized.w);

/** Physical designs first, then the narrower widest device. */
function narrower(a: Evaluated, b: Evaluated): boolean {
  if (physical(a) !== physical(b)) return physical(a);
  return widestOf(a) < widestOf(b);
}

// Designs counted for the nearest points: within the mismatch budget and the width limit, current at mid-span,
// lower devices saturated.
const usable = (e: Evaluated) => e.margins.mismatch >= 0 && e.margins.iout >= 0 && e.margins.saturation >= 0 && e.margins.width >= 0;

// How far a design is from usable: the shortfalls of the margins `usable` reads, each capped as in the ranking's
// distance to feasibility (policy.distanceToFeasible). Between two unusable designs the nearer one leads, so a
// climb from unusable seeds heads for usable designs (e.g. narrower, with a higher setpoint, under a tight width limit).
const shortOf = (x: number) => Math.min(Math.max(0, -x), 50);
const unusability = (e: Evaluated) => shortOf(e.margins.mismatch) + shortOf(e.margins.iout) + shortOf(e.margins.saturation) + shortOf(e.margins.width);

/** Whether usability alone orders a before b (undefined: it does not decide). */
function byUsability(a: Evaluated, b: Evaluated): boolean | undefined {
  const ua = usable(a);
  if (ua !== usable(b)) return ua;
  if (ua) return undefined;
  const da = unusability(a);
  const db = unusability(b);
  return da === db ? undefined : da < db;
}

/**
 * Rout at span, Ω (0 where the table cannot cover it): the closest a design that never meets the Rout target gets to
 * it (its headroom would be the lowest v with Rout ≥ target over all of [v, span], span included).
 */
function routAtSpan(e: Evaluated): number {
  const c = e.nominal.curve;
  const r = c[c.length - 1];
  return Number.isFinite(r) ? r : 0;
}

/** Lower headroom first; among designs that never reach the target, the higher Rout at span first. */
function lowerHeadroom(a: Evaluated, b: Evaluated): boolean {
  const u = byUsability(a, b);
  if (u !== undefined) return u;
  const ha = a.nominal.headroom;
  const hb = b.nominal.headroom;
  if (ha !== hb) return ha < hb;
  return Number.isFinite(ha) ? a.area < b.area : routAtSpan(a) > routAtSpan(b);
}

function higherRout(a: Evaluated, b: Evaluated): boolean {
  const u = byUsability(a, b);
  if (u !== undefined) return u;
  return a.nominal.routAtTarget > b.nominal.routAtTarget;
}

/*
 * Moves the climbs below leave unevaluated, each surely no better than the climb's best and surely changing nothing
 * the report or a later climb reads. Climbing headroom and Rout: only from a usable design (so the pool keeps a
 * saturated one), and only moves surely neither usable nor physical (a mid-span miss; too wide with Rout short at
 * the headroom target), or, climbing Rout, surely below both the target and the climb's Rout, or, climbing headroom,
 * not physical, failing at a scanned point above the climb's headroom and surely outside the two best by Rout (the
 * Rout climb's seeds). The report reads the pool for saturated and physical designs only, so these change nothing
 * there; the seeds of a later climb are the best two by an order putting usable (or physical) designs first, so
 * the pool is settled before one only when it holds fewer than two such designs. Climbing width from a physical
 * design: moves not physical, or no narrower.
 */
const headroomHopeless = (ctx: SolveContext, byRout: Leaders): Hopeless => (l, best) => {
  if (!usable(best)) return false;
  if (l.midMiss) return true;
  if (!routSurelyBelow(l, ctx.spec.rout)) return false;
  if (l.widest > ctx.wmax) return true;
  const r2 = byRout.second();
  return r2 !== undefined && usable(r2) && beyondSeeds(ctx, l, best.nominal.headroom, r2);
};
const routBelowFromUsable = (ctx: SolveContext): Hopeless => (l, best) =>
  usable(best) && (l.midMiss || routSurelyBelow(l, Math.min(best.nominal.routAtTarget, ctx.spec.rout)) || (l.widest > ctx.wmax && routSurelyBelow(l, ctx.spec.rout)));
const widerFromPhysical = (ctx: SolveContext): Hopeless => (l, best) =>
  physical(best) && (l.midMiss || l.widest >= widestOf(best) || routSurelyBelow(l, ctx.spec.rout));

/**
 * The look surely puts the design behind the seeds of both climbs: its targets fail at a scanned point at or above
 * headroom `h` (so its headroom is higher) and its Rout at the headroom target is below `r2`'s.
 */
function beyondSeeds(ctx: SolveContext, l: Look, h: number, r2: Evaluated): boolean {
  return Number.isFinite(h) && routSurelyBelow(l, r2.nominal.routAtTarget) && routSurelyBelowAt(l, scanPointAtOrAbove(ctx.spec.span, h), ctx.spec.rout);
}

/** The best two of the pool (`best`), after settling skipped moves when fewer than two designs are of `first`'s kind. */
function seedsOf(ctx: SolveContext, pool: Evaluated[], seen: Seen, best: () => Evaluated[], first: (e: Evaluated) => boolean): Evaluated[] {
  let n = 0;
  for (const e of pool) if (first(e) && ++n >= 2) break;
  if (n < 2) settle(ctx, seen, pool);
  return best();
}

function bestOf(pool: readonly Evaluated[], prefer: (a: Evaluated, b: Evaluated) => boolean, k: number): Evaluated[] {
  const out: Evaluated[] = [];
  for (const e of pool) placeIn(out, e, prefer, k);
  return out;
}

/** `e` into `out`, the best k so far by `prefer` in order (after those it does not beat). */
function placeIn(out: Evaluated[], e: Evaluated, prefer: (a: Evaluated, b: Evaluated) => boolean, k: number): void {
  let j = out.length;
  while (j > 0 && prefer(e, out[j - 1])) j--;
  if (j < k) out.splice(j, 0, e);
  if (out.length > k) out.pop();
}

/** The best two of a pool by one order, as bestOf gives them, read many times while the pool grows. */
interface Leaders {
  top(): Evaluated[];
  second(): Evaluated | undefined;
}

/**
 * Leaders brought up to date from the designs added since the last read rather than the whole pool each time. Valid
 * while the pool only gains designs and their figures stay as evaluated: until the climbs' answers are finalized.
 */
function leadersOf(pool: readonly Evaluated[], prefer: (a: Evaluated, b: Evaluated) => boolean): Leaders {
  const out: Evaluated[] = [];
  let read = 0;
  const update = () => {
    for (; read < pool.length; read++) placeIn(out, pool[read], prefer, 2);
    return out;
  };
  return { top: () => [...update()], second: () => update()[1] };
}

/**
 * A lifted proposal that surely changes nothing the nearest points read: not physical (Rout at the headroom target
 * surely short of the target, so neither the Rout/headroom pair nor the width question can use it), and surely
 * outside the two best by lower headroom and by higher Rout that seed the climbs (the pool already holds two usable
 * designs; this one is not usable, or its targets fail at a scanned point above the second-lowest headroom and its
 * Rout at the headroom target is below the second-highest). The pool only gains designs, so the second-best figures
 * only improve and the judgement stays true. A climb that reaches it evaluates it then (or rules it out surely).
 */
function outOfReach(ctx: SolveContext, l: Look | null, byHeadroom: Leaders, byRout: Leaders): boolean {
  if (!l || !routSurelyBelow(l, ctx.spec.rout)) return false;
  const h2 = byHeadroom.second();
  const r2 = byRout.second();
  if (!h2 || !r2 || !usable(h2) || !usable(r2)) return false;
  if (l.midMiss || l.widest > ctx.wmax) return true;
  return beyondSeeds(ctx, l, h2.nominal.headroom, r2);
}

/**
 * The screen again with the headroom target lifted towards mid-span (so the VDS setpoints may use all the room below
 * it), each proposal evaluated exactly at the spec's own targets unless a quick look shows it out of reach
 * (`beyond`: left for settle).
 */
function liftedScreen(ctx: SolveContext, topology: Topology, pool: Evaluated[], seen: Seen, beyond: (l: Look | null) => boolean): void {
  const lifted = Math.max(ctx.spec.headroom, ctx.vmid - 0.05);
  if (!(lifted > ctx.spec.headroom)) return;
  const wide: SolveContext = { ...ctx, spec: { ...ctx.spec, headroom: lifted, objective: 'headroom' } };
  for (const c of screen(wide, topology)) {
    const k = seen.key(c);
    let start: Start | undefined;
    if (!seen.has(k)) {
      const l = lookOnce(ctx, seen, k, c);
      if (beyond(l)) {
        defer(seen, k, c);
        continue;
      }
      start = l?.start;
    }
    const e = evaluateOnce(ctx, c, seen, start);
    if (e) pool.push(e);
  }
}

// Designs carried from round to round of probes, and climbs from each one's probes: the best and the best of other
// lengths (the best probe can lead to a lower peak than one a little behind it, e.g. a short device's saturation edge
// against a longer device's ridge).
const LEADS = 2;

/** The best LEADS probes by `prefer`, of distinct lengths. */
function leadsOf(probes: readonly Evaluated[], prefer: (a: Evaluated, b: Evaluated) => boolean): Evaluated[] {
  const out: Evaluated[] = [];
  const lengths = (e: Evaluated) => e.cand.l.join(',');
  for (const e of bestOf(probes, prefer, probes.length)) {
    if (out.length >= LEADS) break;
    if (!out.some((o) => lengths(o) === lengths(e))) out.push(e);
  }
  return out;
}

// Setpoint distance beyond which a design lies in another basin than a seed's, V: two of the screen's setpoint steps.
const BASIN_V = 0.05;

/**
 * `seeds` and the best design of the pool by `prefer` whose setpoints lie in another basin than the first seed's (one
 * differs by more than BASIN_V), when there is one. The leaders are often neighbours on one climb's path, and the
 * nearest point can lie in a basin of its own: a triple's upper setpoint near its bias diode's edge, where Rout at the
 * headroom target rises steeply (audit3 A3-18..A3-20: 8-33 % more than the leaders' basin).
 */
function withOtherBasin(seeds: Evaluated[], pool: readonly Evaluated[], prefer: (a: Evaluated, b: Evaluated) => boolean): Evaluated[] {
  const s = seeds[0]?.cand.setpoints;
  if (!s || s.length === 0) return seeds;
  let other: Evaluated | undefined;
  for (const e of pool) {
    if (e.cand.setpoints.some((x, k) => Math.abs(x - s[k]) > BASIN_V + 1e-9) && (!other || prefer(e, other))) other = e;
  }
  return other ? [...seeds, other] : seeds;
}

// Rounds of a climb towards a nearest point, at most: from a seed far from usable (every device too wide, say) a climb
// can take more steps than the sizing's climbs, each length a grid step at a time, and stopping early leaves it short.
const NEAREST_ROUNDS = 3 * CLIMB_ROUNDS;

// Rounds of line probes and climbs, at most (each round starts from the last round's best designs, and none follows a
// round that finds nothing better): a better design can be several rounds away, one length per round.
const PROBE_ROUNDS = 6;

/**
 * The climb's answer, or a better one found by line probes from it (search/line-probes.ts) and climbs from the best
 * probes, round after round from the best designs so far (see LEADS). A probe is evaluated exactly only when its quick look leaves it a chance (`hopeless` says no otherwise), so
 * where the climb already sits on the best ridge this costs the looks alone. From an answer that is not usable (every
 * design met is too wide, say) every probe is evaluated: the width-limited probes can reach usable designs the climb,
 * a step at a time, does not.
 */
function probeFurther(
  ctx: SolveContext, from: Evaluated, seen: Seen, pool: Evaluated[], prefer: (a: Evaluated, b: Evaluated) => boolean, hopeless: Hopeless,
  saturationEdges = false,
): Evaluated {
  // A probe counts as realisable once evaluated, else by its quick look (made once per search).
  const realisable = (d: Candidate): boolean => {
    const k = seen.key(d);
    const e = seen.get(k);
    return e !== undefined ? e !== null : lookOnce(ctx, seen, k, d) !== null;
  };
  // The probes from `at` that beat it, evaluated.
  const beating = (at: Evaluated): Evaluated[] => {
    const out: Evaluated[] = [];
    for (const c of lineProbes(ctx, at.cand, realisable, saturationEdges)) {
      const k = seen.key(c);
      let e = seen.get(k);
      if (e === undefined) {
        const l = lookOnce(ctx, seen, k, c);
        if (!l || hopeless(l, at)) continue;
        e = evaluateOnce(ctx, c, seen, l.start);
        if (e) pool.push(e);
      }
      if (e && prefer(e, at)) out.push(e);
    }
    return out;
  };
  let beam = [from];
  for (let round = 0; round < PROBE_ROUNDS; round++) {
    const next: Evaluated[] = [];
    for (const at of beam) {
      for (const lead of leadsOf(beating(at), prefer)) {
        const climbed = refine(ctx, [lead], seen, pool, prefer, hopeless, NEAREST_ROUNDS);
        next.push(climbed && prefer(climbed, lead) ? climbed : lead);
      }
    }
    if (next.length === 0) break;
    beam = leadsOf([...beam, ...next], prefer);
  }
  return beam[0];
}

/**
 * A dedicated scan for the nearest points, independent of where the sizing
 * search happened to look: the lifted screen (above), then a climb towards
 * each question from its best few designs.
 */
export function nearestPoints(
  ctx: SolveContext, topology: Topology, pool: Evaluated[], seen: Seen,
  fitsWithin?: (wmax: number) => Evaluated | null,
): Nearest {
  const byHeadroom = leadersOf(pool, lowerHeadroom);
  const byRout = leadersOf(pool, higherRout);
  const beyond = (l: Look | null) => outOfReach(ctx, l, byHeadroom, byRout);
  // What the sizing search left unevaluated, then the lifted screen: only what the nearest points may read.
  settle(ctx, seen, pool, beyond);
  liftedScreen(ctx, topology, pool, seen, beyond);
  // Nothing usable yet (every design too wide, say): designs with every device on the width limit, to climb from.
  if (!pool.some(usable)) {
    for (const c of widthRoomCandidates(ctx, topology)) {
      const e = evaluateOnce(ctx, c, seen);
      if (e) pool.push(e);
    }
  }
  let hr = refine(ctx, byHeadroom.top(), seen, pool, lowerHeadroom, headroomHopeless(ctx, byRout), NEAREST_ROUNDS);
  let ro = refine(ctx, withOtherBasin(seedsOf(ctx, pool, seen, byRout.top, usable), pool, higherRout), seen, pool, higherRout, routBelowFromUsable(ctx), NEAREST_ROUNDS);
  // The saturation-edge probes (see lineProbes) serve Rout at the headroom target only.
  if (ro) ro = probeFurther(ctx, ro, seen, pool, higherRout, routBelowFromUsable(ctx), true);
  if (ro) ro = nearestAlongSetpoints(ctx, ro, seen, pool, higherRout, routBelowFromUsable(ctx), NEAREST_ROUNDS);
  // The headroom climb keeps to devices like its seeds', while the lowest headroom can lie far from them (another
  // length, on the width limit): the same probes follow it, after the Rout climb's, which then sees the pool as before.
  if (hr) hr = probeFurther(ctx, hr, seen, pool, lowerHeadroom, headroomHopeless(ctx, byRout));
  // Those probes can reach a higher Rout at the headroom target than the Rout climb did (audit3 A3-21: both lengths
  // changed from the Rout climb's answer, one from the headroom climb's): the pool's best by Rout, when it leads.
  const lead = byRout.top()[0];
  if (ro && lead && higherRout(lead, ro)) ro = lead;
  // The figures come from the full curve, as every reported design's do, so they match wherever shown.
  if (hr) finalize(ctx, hr);
  if (ro) finalize(ctx, ro);
  let narrowest: number | undefined;
  let atWidth: Evaluated | undefined;
  if (pool.some(physical) && !pool.some((e) => physical(e) && e.margins.width >= 0)) {
    const w = refine(ctx, seedsOf(ctx, pool, seen, () => bestOf(pool, narrower, 2), physical), seen, pool, narrower, widerFromPhysical(ctx));
    if (w && physical(w)) {
      narrowest = widestOf(w);
      atWidth = w;
    }
    // The climb follows one design; bisect on the limit with the whole search for the edge itself.
    let lo = ctx.wmax;
    // The bisection takes no design under a limit where the search found none at a wider one, so when the search at
    // the last limit it would try after failing throughout finds none, that one search settles it.
    let last = lo;
    for (let it = 0; it < 4 && narrowest !== undefined && narrowest > last * 1.01; it++) last = Math.sqrt(last * narrowest);
    // Each limit searched once: where the search at `last` finds a design, failing throughout ends on `last` again.
    const fits = fitsWithin && onceEach(fitsWithin);
    if (fits && narrowest !== undefined && last > lo && fits(last) === null) lo = narrowest;
    for (let it = 0; it < 4 && fits && narrowest !== undefined && narrowest > lo * 1.01; it++) {
      const mid = Math.sqrt(lo * narrowest);
      const fit = fits(mid);
      if (fit === null) lo = mid;
      else if (widestOf(fit) < narrowest) {
        narrowest = widestOf(fit);
        atWidth = physical(fit) ? fit : undefined;
      }
    }
  }
  const atRout = hr && usable(hr) && Number.isFinite(hr.nominal.headroom) ? hr : undefined;
  const atHeadroom = ro && usable(ro) ? ro : undefined;
  const out: Nearest = {
    headroomAtRout: atRout ? atRout.nominal.headroom : Infinity,
    routAtHeadroom: atHeadroom ? atHeadroom.nominal.routAtTarget : 0,
    atRout, atHeadroom, narrowest, atWidth,
  };
  if (ctx.corners.length > 1) out.overCorners = nearestOverCorners(ctx, pool, seen, [hr, ro]);
  return out;
}

/** `f` made once per argument (a search under a width limit is the same whenever it runs). */
function onceEach(f: (w: number) => Evaluated | null): (w: number) => Evaluated | null {
  const made = new Map<number, Evaluated | null>();
  return (w) => {
    let e = made.get(w);
    if (e === undefined) made.set(w, (e = f(w)));
    return e;
  };
}

/** Designs looked at per order for seeds usable at every corner (each look evaluates every corner in full). */
const EVERYWHERE_LOOKS = 100;

/**
 * A design at its worst corner: usable at every corner, the highest headroom and lowest Rout of all corners, and
 * (for designs not usable everywhere) how far from usable: the shortfalls of the nominal corner's mismatch, current,
 * saturation and width margins and of the other corners' current and saturation margins, summed.
 */
function worstCorner(ctx: SolveContext, e: Evaluated): { usable: boolean; headroom: number; rout: number; off: number } {
  const corners = ensureCorners(ctx, e, true);
  let ok = usable(e);
  let headroom = e.nominal.headroom;
  let rout = e.nominal.routAtTarget;
  let off = unusability(e);
  for (const c of corners) {
    if (!c.ev || c.margins.iout < 0 || c.margins.saturation < 0) ok = false;
    off += c.ev ? shortOf(c.margins.iout) + shortOf(c.margins.saturation) : Infinity;
    headroom = Math.max(headroom, c.ev ? c.ev.headroom : Infinity);
    rout = Math.min(rout, c.ev ? c.ev.routAtTarget : 0);
  }
  return { usable: ok, headroom, rout, off };
}

/**
 * The nearest points over every corner: climbs by the worst corner's figures, from the best designs by the nominal
 * ones (and the nominal nearest designs). A design's worst headroom is at least its nominal one and its worst Rout at
 * most its nominal one, so a move already behind the climb's best at the nominal corner is passed over without
 * evaluating its other corners.
 */
function nearestOverCorners(ctx: SolveContext, pool: Evaluated[], seen: Seen, nominal: ReadonlyArray<Evaluated | undefined>): OverCorners {
  const worst = (e: Evaluated) => worstCorner(ctx, e);
  // Designs usable at the nominal corner but not at every corner climb towards the other corners' current window.
  const lower = (a: Evaluated, b: Evaluated): boolean => {
    const wb = worst(b);
    if (wb.usable && !(a.nominal.headroom <= wb.headroom)) return false;
    const wa = worst(a);
    if (wa.usable !== wb.usable) return wa.usable;
    if (!wa.usable && wa.off !== wb.off) return wa.off < wb.off;
    if (wa.headroom !== wb.headroom) return wa.headroom < wb.headroom;
    return Number.isFinite(wa.headroom) ? a.area < b.area : wa.rout > wb.rout;
  };
  const higher = (a: Evaluated, b: Evaluated): boolean => {
    const wb = worst(b);
    if (wb.usable && !(a.nominal.routAtTarget >= wb.rout)) return false;
    const wa = worst(a);
    if (wa.usable !== wb.usable) return wa.usable;
    if (!wa.usable && wa.off !== wb.off) return wa.off < wb.off;
    return wa.rout > wb.rout;
  };
  // Seeds: the nominal winners and leaders, and the first designs usable at every corner by each nominal order
  // (the nominal leaders may all lose the current window at another corner while other designs keep it).
  // Each look costs every corner's full evaluation: at most EVERYWHERE_LOOKS per order (the climbs do the rest).
  const everywhere = (order: (a: Evaluated, b: Evaluated) => boolean): Evaluated[] => {
    const out: Evaluated[] = [];
    const ranked = pool.filter(usable).sort((a, b) => (order(a, b) ? -1 : order(b, a) ? 1 : 0)).slice(0, EVERYWHERE_LOOKS);
    for (const e of ranked) {
      if (worst(e).usable) out.push(e);
      if (out.length >= 2) break;
    }
    return out;
  };
  const starts = [...new Set([
    ...nominal, ...bestOf(pool, lowerHeadroom, 4), ...bestOf(pool, higherRout, 4), ...everywhere(lowerHeadroom), ...everywhere(higherRout),
  ])].filter((e): e is Evaluated => e !== undefined);
  const hr = refine(ctx, bestOf(starts, lower, 2), seen, pool, lower);
  const ro = refine(ctx, bestOf(starts, higher, 2), seen, pool, higher);
  // Reported figures come from the full curve at every corner, as the designs' own do.
  if (hr) finalize(ctx, hr);
  if (ro) finalize(ctx, ro);
  const h = hr ? worst(hr) : undefined;
  const r = ro ? worst(ro) : undefined;
  return {
    headroomAtRout: h && h.usable && Number.isFinite(h.headroom) ? h.headroom : Infinity,
    routAtHeadroom: r && r.usable ? r.rout : 0,
  };
}
