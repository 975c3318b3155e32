import type { Polarity } from '../table/types.js';
import { rolesOf, squareLawCheck } from '../stack/index.js';
import { formatEng } from '../units/index.js';
import type { BiasResult, CornerResult, CurvePoint, DeviceResult, Predicted, SquareLawCheck, StackResult } from './types.js';
import type { SolveContext } from './context.js';
import type { StackSpec } from '../spec/types.js';
import { CURRENT_WINDOW, describe, meetsAll, reportedHeadroom, tightest, widest, type Margins } from './checks.js';
import { ensureCorners, nominalOk, type Evaluated } from './evaluate.js';
import type { StackEval } from './stackeval.js';
import type { Nearest } from './nearest.js';

/** Absolute voltage to ground of a stack-coordinate voltage. */
export function absolute(device: Polarity, supply: number, x: number): number {
  return device === 'n' ? x : supply - x;
}

/**
 * Predicted figures of one evaluation. `feasible` false: Rout is the one the spec asks about, the lowest over
 * [target headroom, span] (the figure the explanation quotes); else over [headroom, span].
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
  return ev.curve.map((c) => ({ v: c.v, vout: absolute(device, supply, c.v), iout: c.i, rout: c.rout }));
}

function devicesOf(e: Evaluated, device: Polarity, supply: number): DeviceResult[] {
  const roles = rolesOf(e.cand.topology);
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
  const s = squareLawCheck(e.cand.topology, e.slices, e.sized.w, e.nominal.mid.devices, ctx.spec.current);
  return Number.isFinite(s.vth) ? s : undefined;
}

/** One corner's report: why it fails (`binding`) or, when it meets every target, what is tightest. */
export function cornerResult(
  spec: StackSpec, corner: string, m: Margins, ev: StackEval | null, sigma: number | undefined,
  at: { area: number; biasArea: number; gates: readonly number[]; supply: number },
): CornerResult {
  const feasible = meetsAll(m);
  const words = describe(tightest(m), spec, ev, sigma);
  const r: CornerResult = {
    corner, feasible,
    predicted: predictedOf(ev, at.area, at.biasArea, sigma, feasible),
    gates: at.gates.map((g) => absolute(spec.device, at.supply, g)),
  };
  if (feasible) r.tightest = words;
  else r.binding = words;
  return r;
}

/** Per-corner report, the nominal corner first. */
function cornerResults(ctx: SolveContext, e: Evaluated): CornerResult[] {
  const at = (gates: readonly number[]) => ({ area: e.area, biasArea: e.biasArea, gates, supply: ctx.supply });
  const nominal = cornerResult(ctx.spec, ctx.nominal, e.margins, e.nominal, e.sigma, at(e.nominal.gates));
  const others = ensureCorners(ctx, e, true).map((c) => cornerResult(ctx.spec, c.corner, c.margins, c.ev, c.sigma, at(c.gates)));
  return [nominal, ...others];
}

function smallest(m: Margins): number {
  return Math.min(m.rout, m.headroom, m.iout, m.mismatch, m.saturation, m.width);
}

/** Words for why nothing met the targets, and the nearest points reached. */
function infeasibility(ctx: SolveContext, best: Evaluated, pool: readonly Evaluated[], near: Nearest): Pick<StackResult, 'binding' | 'nearest'> {
  const s = ctx.spec;
  const nearest = { headroomAtRout: reportedHeadroom(near.headroomAtRout), routAtHeadroom: near.routAtHeadroom };
  const mm = (e: Evaluated) => e.margins.mismatch >= 0;
  if (!pool.some((e) => e.margins.saturation >= 0)) {
    const room = `no explored ${best.cand.topology} keeps its lower devices saturated below the ${s.headroom.toFixed(3)} V headroom target`;
    return { binding: `${describe('saturation', s, best.nominal, best.sigma)}; ${room}`, nearest };
  }
  if (nominalOk(best)) {
    const c = (best.corners ?? []).find((x) => !meetsAll(x.margins));
    if (c) return { binding: `corner ${c.corner}: ${describe(tightest(c.margins), s, c.ev, c.sigma)}`, nearest };
  }
  const physical = pool.filter((e) => e.margins.rout >= 0 && e.margins.headroom >= 0);
  if (near.narrowest !== undefined) {
    const w = near.narrowest;
    return { binding: `width: every design meeting Rout and headroom has a device at least ${formatEng(w, 'm')} wide, above the ${formatEng(ctx.wmax, 'm')} width limit`, nearest };
  }
  if (s.mismatch !== undefined && physical.length > 0 && !physical.some(mm)) {
    const sig = Math.min(...physical.map((e) => e.sigma ?? Infinity));
    return { binding: `mismatch: best σ ${(sig * 100).toFixed(3)} % (target ${(s.mismatch * 100).toFixed(3)} %) with rout and headroom met`, nearest };
  }
  if (physical.some((e) => e.margins.iout < 0) && !physical.some((e) => e.margins.iout >= 0)) {
    return { binding: `iout: ${describe('iout', s, best.nominal, best.sigma)}`, nearest };
  }
  const cornerMiss = pool.find((e) => nominalOk(e) && e.corners?.some((c) => !meetsAll(c.margins)));
  const c = cornerMiss?.corners?.find((x) => !meetsAll(x.margins));
  if (c) return { binding: `corner ${c.corner}: ${describe(tightest(c.margins), s, c.ev, c.sigma)} (designs meeting the targets at ${ctx.nominal} miss them there)`, nearest };
  return { binding: routHeadroomWords(s, nearest), nearest };
}

/**
 * Words for a missed Rout/headroom pair from the nearest points:
 * "rout: best 4.21 MΩ at the 0.500 V headroom target (needs 100 MΩ); no allowed design reaches 100 MΩ at any headroom up to the 1.500 V span".
 */
export function routHeadroomWords(s: StackSpec, nearest: { headroomAtRout: number; routAtHeadroom: number }): string {
  const need = formatEng(s.rout, 'Ω');
  const target = `${s.headroom.toFixed(3)} V`;
  const h = nearest.headroomAtRout;
  const r = nearest.routAtHeadroom;
  const anyHeadroom = Number.isFinite(h)
    ? `${need} needs ${h.toFixed(3)} V of headroom at best`
    : `no allowed design reaches ${need} at any headroom up to the ${s.span.toFixed(3)} V span`;
  if (r >= s.rout && h <= s.headroom) {
    return `no explored design meets everything at once: Rout reaches ${formatEng(r, 'Ω')} at ${target} and ${h.toFixed(3)} V of headroom is reachable, but not together with the other targets`;
  }
  if (r >= s.rout && !Number.isFinite(h)) {
    const pct = (CURRENT_WINDOW * 100).toFixed(0);
    return `iout: Rout reaches ${formatEng(r, 'Ω')} at ${target}, but in every allowed design the output current leaves its ${pct} % window of the mid-span value before the ${s.span.toFixed(3)} V span`;
  }
  if (r >= s.rout && Number.isFinite(h)) {
    // Rout is there at the target, so the current window is what pushes the headroom up.
    const pct = (CURRENT_WINDOW * 100).toFixed(0);
    return `headroom: best ${h.toFixed(3)} V (needs ${target}); Rout reaches ${formatEng(r, 'Ω')} at ${target} but the current leaves its ${pct} % window below ${h.toFixed(3)} V`;
  }
  if (r > 0) return `rout: best ${formatEng(r, 'Ω')} at the ${target} headroom target (needs ${need}); ${anyHeadroom}`;
  return `rout: no allowed design has a usable Rout at the ${target} headroom target (outside the table); ${anyHeadroom}`;
}

/** The report for one topology: the chosen design, its corners, and why it fails if it does. */
export function stackResult(ctx: SolveContext, best: Evaluated, pool: Evaluated[], evaluated: () => number, nearest: () => Nearest): StackResult {
  const { spec, supply } = ctx;
  let corners = cornerResults(ctx, best);
  const feasible = corners.every((c) => c.feasible);
  let near: Nearest | undefined;
  if (!feasible) {
    near = nearest();
    const shown = shownWhenInfeasible(ctx, best, pool, near);
    if (shown !== best) {
      best = shown;
      corners = cornerResults(ctx, best);
    }
  }
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
  if (near) Object.assign(r, infeasibility(ctx, best, pool, near));
  else {
    const all = [{ corner: ctx.nominal, m: best.margins }, ...(best.corners ?? []).map((c) => ({ corner: c.corner, m: c.margins }))];
    const worst = all.reduce((a, b) => (smallest(b.m) < smallest(a.m) ? b : a));
    const words = corners.find((c) => c.corner === worst.corner)?.tightest ?? '';
    r.tightest = ctx.corners.length > 1 ? `corner ${worst.corner}: ${words}` : words;
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
  if (near.atHeadroom && near.routAtHeadroom < ctx.spec.rout) return near.atHeadroom;
  if (near.atRout) return near.atRout;
  return near.atHeadroom ?? best;
}

/** The width limit, and the current the tables carry at it when the target is above that. */
function withLimits(ctx: SolveContext, r: StackResult): StackResult {
  r.wmax = ctx.wmax;
  if (ctx.spec.current > ctx.currentLimit) r.currentLimit = ctx.currentLimit;
  return r;
}

/** A placeholder result when no candidate could be realised from the table at all. */
export function emptyResult(ctx: SolveContext, topology: StackResult['topology'], evaluated: number, why: string): StackResult {
  return withLimits(ctx, {
    name: ctx.spec.name, device: ctx.spec.device, topology, feasible: false,
    binding: why, nearest: { headroomAtRout: Infinity, routAtHeadroom: 0 },
    devices: [], bias: [], predicted: predictedOf(null, NaN, NaN, undefined), curve: [], evaluated,
  });
}
