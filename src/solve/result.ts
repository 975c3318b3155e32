import type { Polarity } from '../table/types.js';
import { rolesOf, squareLawCheck } from '../stack/index.js';
import { formatEng } from '../units/index.js';
import type { BiasResult, CornerResult, CurvePoint, DeviceResult, Predicted, SquareLawCheck, StackResult } from './types.js';
import type { SolveContext } from './context.js';
import { describe, meetsAll, tightest, type Margins } from './checks.js';
import { ensureCorners, nominalOk, type Evaluated } from './evaluate.js';
import type { StackEval } from './stackeval.js';

/** Absolute voltage to ground of a stack-coordinate voltage. */
export function absolute(device: Polarity, supply: number, x: number): number {
  return device === 'n' ? x : supply - x;
}

export function predictedOf(ev: StackEval | null, area: number, biasArea: number, sigma: number | undefined): Predicted {
  const p: Predicted = {
    iout: ev ? ev.iout : NaN,
    rout: ev ? ev.rout : NaN,
    headroom: ev ? ev.headroom : Infinity,
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

/** Per-corner report, the nominal corner first. */
function cornerResults(ctx: SolveContext, e: Evaluated): CornerResult[] {
  const { device } = ctx.spec;
  const nominal: CornerResult = {
    corner: ctx.nominal, feasible: nominalOk(e),
    predicted: predictedOf(e.nominal, e.area, e.biasArea, e.sigma),
    gates: e.nominal.gates.map((g) => absolute(device, ctx.supply, g)),
    binding: describe(tightest(e.margins), ctx.spec, e.nominal, e.sigma),
  };
  const others = ensureCorners(ctx, e, true).map((c): CornerResult => ({
    corner: c.corner, feasible: meetsAll(c.margins),
    predicted: predictedOf(c.ev, e.area, e.biasArea, c.sigma),
    gates: c.gates.map((g) => absolute(device, ctx.supply, g)),
    binding: describe(tightest(c.margins), ctx.spec, c.ev, c.sigma),
  }));
  return [nominal, ...others];
}

function smallest(m: Margins): number {
  return Math.min(m.rout, m.headroom, m.iout, m.mismatch);
}

/** Words for why nothing met the targets, and the nearest points reached. */
function infeasibility(ctx: SolveContext, best: Evaluated, pool: readonly Evaluated[]): Pick<StackResult, 'binding' | 'nearest'> {
  const s = ctx.spec;
  const mm = (e: Evaluated) => e.margins.mismatch >= 0;
  // Nearest points among designs meeting mismatch and current; among all when none does.
  const usable = pool.some((e) => mm(e) && e.margins.iout >= 0);
  let headroomAtRout = Infinity;
  let routAtHeadroom = 0;
  for (const e of pool) {
    if (usable && (!mm(e) || e.margins.iout < 0)) continue;
    // A finite headroom already means Rout ≥ target above it.
    headroomAtRout = Math.min(headroomAtRout, e.nominal.headroom);
    routAtHeadroom = Math.max(routAtHeadroom, e.nominal.routAtTarget);
  }
  const nearest = { headroomAtRout, routAtHeadroom };
  const h = Number.isFinite(headroomAtRout) ? `${headroomAtRout.toFixed(3)} V` : 'none';
  if (nominalOk(best)) {
    const c = (best.corners ?? []).find((x) => !meetsAll(x.margins));
    if (c) return { binding: `corner ${c.corner}: ${describe(tightest(c.margins), s, c.ev, c.sigma)}`, nearest };
  }
  const physical = pool.filter((e) => e.margins.rout >= 0 && e.margins.headroom >= 0);
  if (s.mismatch !== undefined && physical.length > 0 && !physical.some(mm)) {
    const sig = Math.min(...physical.map((e) => e.sigma ?? Infinity));
    return { binding: `mismatch: best σ ${(sig * 100).toFixed(3)} % (target ${(s.mismatch * 100).toFixed(3)} %) with rout and headroom met`, nearest };
  }
  if (physical.some((e) => e.margins.iout < 0) && !physical.some((e) => e.margins.iout >= 0)) {
    return { binding: `iout: ${describe('iout', s, best.nominal, best.sigma)}`, nearest };
  }
  if (routAtHeadroom > 0) {
    return { binding: `rout: best ${formatEng(routAtHeadroom, 'Ω')} at ${s.headroom.toFixed(3)} V headroom (target ${formatEng(s.rout, 'Ω')}); best headroom at the rout target ${h}`, nearest };
  }
  return { binding: `headroom: best ${h} at the rout target (target ${s.headroom.toFixed(3)} V)`, nearest };
}

/** The report for one topology: the chosen design, its corners, and why it fails if it does. */
export function stackResult(ctx: SolveContext, best: Evaluated, pool: readonly Evaluated[], evaluated: number): StackResult {
  const { spec, supply } = ctx;
  const corners = cornerResults(ctx, best);
  const feasible = corners.every((c) => c.feasible);
  const r: StackResult = {
    name: spec.name, device: spec.device, topology: best.cand.topology, feasible,
    devices: devicesOf(best, spec.device, supply),
    bias: biasOf(best, spec.device, supply),
    predicted: predictedOf(best.nominal, best.area, best.biasArea, best.sigma),
    curve: curveOf(best.nominal, spec.device, supply),
    corners,
    evaluated,
  };
  const sq = squareLawOf(ctx, best);
  if (sq) r.squareLaw = sq;
  if (!feasible) Object.assign(r, infeasibility(ctx, best, pool));
  else if (ctx.corners.length > 1) {
    const all = [{ corner: ctx.nominal, m: best.margins }, ...(best.corners ?? []).map((c) => ({ corner: c.corner, m: c.margins }))];
    const worst = all.reduce((a, b) => (smallest(b.m) < smallest(a.m) ? b : a));
    r.binding = `corner ${worst.corner} binds: ${corners.find((c) => c.corner === worst.corner)?.binding ?? ''}`;
  }
  return r;
}

/** A placeholder result when no candidate could be realised from the table at all. */
export function emptyResult(ctx: SolveContext, topology: StackResult['topology'], evaluated: number, why: string): StackResult {
  return {
    name: ctx.spec.name, device: ctx.spec.device, topology, feasible: false,
    binding: why, nearest: { headroomAtRout: Infinity, routAtHeadroom: 0 },
    devices: [], bias: [], predicted: predictedOf(null, NaN, NaN, undefined), curve: [], evaluated,
  };
}
