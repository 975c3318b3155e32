import type { Polarity } from '../table/types.js';
import { squareLawCheck } from '../stack/index.js';
import { topologyOf } from '../topology/index.js';
import type { BiasResult, CornerResult, CurvePoint, DeviceResult, Predicted, SquareLawCheck, StackResult } from './types.js';
import type { SolveContext } from './context.js';
import type { StackSpec } from '../design/types.js';
import { tightest, type Margins, type Target } from './evaluate/checks.js';
import { meetsAll, reportedHeadroom } from '../policy.js';
import type { Nearest } from './nearest.js';
import { verdict, verdictOf, type Verdict } from './evaluate/verdict.js';
import { ensureCorners, finalize, nominalOk, type Evaluated } from './evaluate/evaluate.js';
import { curveFigures, type StackEval } from './evaluate/stack-eval.js';

/** Absolute voltage to ground of a stack-coordinate voltage. */
export function absolute(device: Polarity, supply: number, x: number): number {
  return device === 'n' ? x : supply - x;
}

/**
 * Predicted figures of one evaluation. `feasible` false: Rout is the one the spec asks about, the lowest over
 * [target headroom, span] (the figure the explanation quotes); else over [headroom, span]. Headroom is rounded up
 * to the mV, as everywhere it is shown.
 */
export function predictedOf(ev: StackEval | null, area: number, biasArea: number, sigma: number | undefined, feasible = true): Predicted {
  const p: Predicted = {
    iout: ev ? ev.iout : NaN,
    rout: ev ? (feasible ? ev.rout : ev.routAtTarget) : NaN,
    headroom: ev ? reportedHeadroom(ev.headroom) : Infinity,
    area,
    biasArea,
  };
  if (sigma !== undefined) p.sigma = sigma;
  return p;
}

export function curveOf(ev: StackEval, device: Polarity, supply: number): CurvePoint[] {
  return curveFigures(ev).map((c) => ({ v: c.v, vout: absolute(device, supply, c.v), iout: c.i, rout: c.rout }));
}

function devicesOf(e: Evaluated, device: Polarity, supply: number): DeviceResult[] {
  const roles = topologyOf(e.cand.topology).roles;
  return e.nominal.devices.map((d, k) => {
    const b = e.nominal.mid.devices[k];
    const op = d.slice.op(b.vgs, b.vds, b.vsb, d.w);
    return {
      role: roles[k], w: d.w, l: d.slice.l, gate: absolute(device, supply, e.nominal.gates[k]),
      vgs: b.vgs, vds: b.vds, vsb: b.vsb,
      gmid: b.gm / b.id, id: b.id, gm: b.gm, gds: b.gds, gmb: b.gmb,
      gain: b.gm / b.gds, jd: b.id / d.w, ft: op.ft,
      vdsat: e.nominal.vdsat[k],
    };
  });
}

function biasOf(e: Evaluated, device: Polarity, supply: number): BiasResult[] {
  return e.bias.map((b) => {
    const r: BiasResult = { drives: b.drives, w: b.w, l: b.l, current: b.current, voltage: absolute(device, supply, b.gate) };
    if (b.stackedOn !== undefined) r.stackedOn = b.stackedOn;
    return r;
  });
}

function squareLawOf(ctx: SolveContext, e: Evaluated): SquareLawCheck | undefined {
  const s = squareLawCheck(topologyOf(e.cand.topology), e.slices, e.sized.w, e.nominal.mid.devices, ctx.spec.current);
  return Number.isFinite(s.vth) ? s : undefined;
}

/** One corner's report: why it fails (`binding`) or, when it meets every target, what is tightest. */
export function cornerResult(
  spec: StackSpec, corner: string, m: Margins, ev: StackEval | null, sigma: number | undefined,
  at: { area: number; biasArea: number; gates: readonly number[]; supply: number; vmid: number },
  prefer?: Target,
): CornerResult {
  const feasible = meetsAll(m);
  // A failing corner names the stack's binding target when this design misses it too, so the corner row and the
  // summary do not name two targets for one miss ("rout 996 kΩ < 500 MΩ" over "headroom never met").
  const words = verdictOf(prefer !== undefined && m[prefer] < 0 ? prefer : tightest(m), spec, ev, sigma, at.vmid, corner);
  const r: CornerResult = {
    corner, feasible,
    predicted: predictedOf(ev, at.area, at.biasArea, sigma, feasible),
    gates: at.gates.map((g) => absolute(spec.device, at.supply, g)),
  };
  if (feasible) r.tightest = words;
  else r.binding = words;
  return r;
}

/** Per-corner report, the nominal corner first; at the corner of `binding`, its target named where this design misses it. */
function cornerResults(ctx: SolveContext, e: Evaluated, binding?: Verdict): CornerResult[] {
  const at = (gates: readonly number[]) => ({ area: e.area, biasArea: e.biasArea, gates, supply: ctx.supply, vmid: ctx.vmid });
  const prefer = (corner: string) => (binding?.corner === corner ? sameMeaning(binding.target) : undefined);
  const nominal = cornerResult(ctx.spec, ctx.nominal, e.margins, e.nominal, e.sigma, at(e.nominal.gates), prefer(ctx.nominal));
  const others = ensureCorners(ctx, e, true).map((c) => cornerResult(ctx.spec, c.corner, c.margins, c.ev, c.sigma, at(c.gates), prefer(c.corner)));
  return [nominal, ...others];
}

/**
 * A binding target whose verdict on one design means what the stack's verdict means (width and iout do not: the
 * stack's width is the narrowest any design needs, its iout miss is at the span end).
 */
function sameMeaning(target: Verdict['target']): Target | undefined {
  return target === 'rout' || target === 'headroom' || target === 'mismatch' || target === 'saturation' ? target : undefined;
}

function smallest(m: Margins): number {
  return Math.min(m.rout, m.headroom, m.iout, m.mismatch, m.saturation, m.width);
}

/** Why nothing met the targets, and the nearest points reached. */
function infeasibility(ctx: SolveContext, best: Evaluated, pool: readonly Evaluated[], near: Nearest): Pick<StackResult, 'binding' | 'nearest'> {
  const s = ctx.spec;
  const on = (target: Verdict['target'] & keyof Margins, e: { ev: Evaluated['nominal'] | null; sigma?: number }, corner: string) => verdictOf(target, s, e.ev, e.sigma, ctx.vmid, corner);
  const nearest: { headroomAtRout: number; routAtHeadroom: number; corner: string; overCorners?: { headroomAtRout: number; routAtHeadroom: number } } = { headroomAtRout: reportedHeadroom(near.headroomAtRout), routAtHeadroom: near.routAtHeadroom, corner: ctx.nominal };
  const oc = near.overCorners;
  if (oc) nearest.overCorners = { headroomAtRout: reportedHeadroom(oc.headroomAtRout), routAtHeadroom: oc.routAtHeadroom };
  const nominal = { ev: best.nominal, sigma: best.sigma };
  if (!pool.some((e) => e.margins.saturation >= 0)) return { binding: on('saturation', nominal, ctx.nominal), nearest };
  if (nominalOk(best)) {
    const c = (best.corners ?? []).find((x) => !meetsAll(x.margins));
    if (c) return { binding: on(tightest(c.margins), c, c.corner), nearest };
  }
  // Every design meeting Rout and headroom is wider than the limit: the narrowest width they need.
  if (near.narrowest !== undefined) return { binding: verdict('width', ctx.wmax, near.narrowest, undefined, ctx.nominal), nearest };
  const physical = pool.filter((e) => e.margins.rout >= 0 && e.margins.headroom >= 0);
  const lowest = mismatchNearest(ctx, pool);
  if (lowest) return { binding: verdict('mismatch', s.mismatch, lowest.sigma, ctx.vmid, ctx.nominal), nearest };
  if (physical.some((e) => e.margins.iout < 0) && !physical.some((e) => e.margins.iout >= 0)) {
    return { binding: on('iout', nominal, ctx.nominal), nearest };
  }
  // Designs meeting the targets at the nominal corner miss them at another.
  const cornerMiss = pool.find((e) => nominalOk(e) && e.corners?.some((c) => !meetsAll(c.margins)));
  const c = cornerMiss?.corners?.find((x) => !meetsAll(x.margins));
  if (c) return { binding: on(tightest(c.margins), c, c.corner), nearest };
  return { binding: nearestMiss(ctx, best, nearest), nearest };
}

/**
 * The missed Rout/headroom pair from the nearest points: Rout at the headroom
 * target when it falls short, else the headroom it takes (the current window
 * is what pushes it up), else the tightest target of the best design (each
 * target is reachable, but not together).
 */
function nearestMiss(ctx: SolveContext, best: Evaluated, nearest: { headroomAtRout: number; routAtHeadroom: number }): Verdict {
  const s = ctx.spec;
  const { headroomAtRout: h, routAtHeadroom: r } = nearest;
  if (r >= s.rout && h <= s.headroom) return verdictOf(tightest(best.margins), s, best.nominal, best.sigma, ctx.vmid, ctx.nominal);
  if (r >= s.rout && Number.isFinite(h)) return verdict('headroom', s.headroom, h, undefined, ctx.nominal);
  if (r >= s.rout) {
    // Rout is there at the target, but no design keeps its current in the window up to the span.
    const top = curveFigures(best.nominal).at(-1);
    return verdict('iout', best.nominal.iout, top?.i, s.span, ctx.nominal);
  }
  return verdict('rout', s.rout, r > 0 ? r : undefined, s.headroom, ctx.nominal);
}

/**
 * The report for one topology: the chosen design, its corners, and why it fails if it does. `climb`: a climb by the
 * spec's order from a design the nearest scan found meeting every target.
 */
export function stackResult(
  ctx: SolveContext, best: Evaluated, pool: Evaluated[], evaluated: () => number, nearest: () => Nearest, climb?: (e: Evaluated) => Evaluated,
): StackResult {
  const { spec, supply } = ctx;
  let corners = cornerResults(ctx, best);
  let near: Nearest | undefined;
  if (!corners.every((c) => c.feasible)) {
    near = nearest();
    const shown = shownWhenInfeasible(ctx, best, pool, near);
    if (shown !== best) {
      best = shown;
      corners = cornerResults(ctx, best);
      // The nearest scan can reach a design meeting every target at every corner that the search missed: then
      // the stack is feasible, and its verdict, corner rows and figures all say so (one verdict, not two).
      if (corners.every((c) => c.feasible)) {
        near = undefined;
        // It was found for the nearest point, not the objective: the search's climb goes on from it (kept only when
        // the full curve confirms the targets).
        const climbed = climb?.(best);
        if (climbed && climbed !== best && finalize(ctx, climbed)) {
          best = climbed;
          corners = cornerResults(ctx, best);
        }
      }
    }
  }
  const feasible = near === undefined;
  const r: StackResult = {
    name: spec.name, device: spec.device, topology: best.cand.topology, feasible,
    devices: devicesOf(best, spec.device, supply),
    bias: biasOf(best, spec.device, supply),
    predicted: predictedOf(best.nominal, best.area, best.biasArea, best.sigma, feasible),
    curve: curveOf(best.nominal, spec.device, supply),
    corners,
    evaluated: 0,
  };
  const sq = squareLawOf(ctx, best);
  if (sq) r.squareLaw = sq;
  if (near) {
    Object.assign(r, infeasibility(ctx, best, pool, near));
    r.corners = cornerResults(ctx, best, r.binding);
  } else {
    const all = [{ corner: ctx.nominal, m: best.margins }, ...(best.corners ?? []).map((c) => ({ corner: c.corner, m: c.margins }))];
    const worst = all.reduce((a, b) => (smallest(b.m) < smallest(a.m) ? b : a));
    const t = corners.find((c) => c.corner === worst.corner)?.tightest;
    if (t) r.tightest = t;
  }
  r.evaluated = evaluated();
  return withLimits(ctx, r);
}

/**
 * The design an infeasible stack shows: the one reaching the nearest point of the
 * target that binds (the best Rout at the headroom target when Rout is short
 * there, else the lowest headroom at the Rout target), so the figures in its
 * table are the figures in its explanation. A design meeting the nominal
 * targets (failing at another corner) or one kept for a saturation failure stays.
 */
function shownWhenInfeasible(ctx: SolveContext, best: Evaluated, pool: readonly Evaluated[], near: Nearest): Evaluated {
  if (nominalOk(best) || !pool.some((e) => e.margins.saturation >= 0)) return best;
  // Mismatch binds: the design with the lowest σ, so the verdict's σ is the σ shown (one number everywhere).
  if (near.narrowest === undefined) {
    const lowest = mismatchNearest(ctx, pool);
    if (lowest) return lowest;
  }
  if (near.atHeadroom && near.routAtHeadroom < ctx.spec.rout) return near.atHeadroom;
  if (near.atRout) return near.atRout;
  // Width binds and no design within the limit is usable: the narrowest design meeting the rest, whose widest device
  // is the figure the verdict quotes.
  return near.atHeadroom ?? near.atWidth ?? best;
}

/**
 * When mismatch alone stands in the way (designs meet Rout and headroom, none
 * the σ target): the one of them with the lowest σ; else undefined.
 */
function mismatchNearest(ctx: SolveContext, pool: readonly Evaluated[]): (Evaluated & { sigma: number }) | undefined {
  if (ctx.spec.mismatch === undefined) return undefined;
  const physical = pool.filter((e) => e.margins.rout >= 0 && e.margins.headroom >= 0);
  if (physical.length === 0 || physical.some((e) => e.margins.mismatch >= 0)) return undefined;
  let lowest: (Evaluated & { sigma: number }) | undefined;
  for (const e of physical) if (e.sigma !== undefined && (!lowest || e.sigma < lowest.sigma)) lowest = e as Evaluated & { sigma: number };
  return lowest;
}

/** The width limit, and the current the tables carry at it when the target is above that. */
function withLimits(ctx: SolveContext, r: StackResult): StackResult {
  r.wmax = ctx.wmax;
  if (ctx.spec.current > ctx.currentLimit) r.currentLimit = ctx.currentLimit;
  return r;
}

/** A placeholder result when no candidate could be realised from the table at all. */
export function emptyResult(ctx: SolveContext, topology: StackResult['topology'], evaluated: number, why: Verdict): StackResult {
  return withLimits(ctx, {
    name: ctx.spec.name, device: ctx.spec.device, topology, feasible: false,
    binding: why, nearest: { headroomAtRout: Infinity, routAtHeadroom: 0, corner: ctx.nominal },
    devices: [], bias: [], predicted: predictedOf(null, NaN, NaN, undefined), curve: [], evaluated,
  });
}
