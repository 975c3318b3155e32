import type { Polarity } from '../table/types.js';
import { topologyOf } from '../topology/index.js';
import type { StageSpec, Topology } from '../design/types.js';
import {
  gainOverSwingWithEdges, handSideRout, handStageGain, handSwing, saturationVoltage, squareLawCheck, SWING_TOLERANCE,
  type BiasDevice, type DeviceBias, type StackDevice,
} from '../stack/index.js';
import type { BiasResult, DeviceResult } from './types.js';
import { absolute } from './result.js';
import { fineTrace, type StageAt, type StageDesign, type StageSides } from './stage-eval.js';
import { meets, nominalOk, stageMargins, withinRails, type StageMargins } from './stage-rank.js';
import { vinRail } from './stage-rails.js';
import type { StageNearest } from './stage-refine.js';
import type {
  StageCorner, StageCurvePoint, StageFrontPoint, StagePredicted, StageResult, StageSide, StageSquareLaw, StageTarget, StageVerdict,
} from './stage-types.js';

function deviceRecords(
  device: Polarity, supply: number, topology: Topology, devices: readonly StackDevice[], ops: readonly DeviceBias[],
  gates: readonly number[], ut: number,
): DeviceResult[] {
  const roles = topologyOf(topology).roles;
  return devices.map((d, k) => {
    const b = ops[k];
    const op = d.slice.op(b.vgs, b.vds, b.vsb, d.w);
    return {
      role: roles[k], w: d.w, l: d.slice.l, gate: absolute(device, supply, gates[k]),
      vgs: b.vgs, vds: b.vds, vsb: b.vsb,
      gmid: b.gm / b.id, id: b.id, gm: b.gm, gds: b.gds, gmb: b.gmb,
      gain: b.gm / b.gds, jd: b.id / d.w, ft: Number.isFinite(op.ft) ? op.ft : 0,
      vdsat: saturationVoltage(d.slice, b.gm / b.id, b.vsb, ut),
    };
  });
}

function biasRecords(device: Polarity, supply: number, bias: readonly BiasDevice[]): BiasResult[] {
  return bias.map((b) => {
    const r: BiasResult = { drives: b.drives, w: b.w, l: b.l, current: b.current, voltage: absolute(device, supply, b.gate) };
    if (b.stackedOn !== undefined) r.stackedOn = b.stackedOn;
    return r;
  });
}

function sidesOf(sides: StageSides, d: StageDesign): { input: StageSide; load: StageSide } {
  const { supply } = sides;
  const at = d.nominal;
  const p = at.trace.points[at.trace.j0];
  const inDev = sides.input.device;
  const ldDev = sides.load.device;
  const inTop = d.input.cand.topology;
  const ldTop = d.load.cand.topology;
  if (!p) {
    return {
      input: { device: inDev, topology: inTop, devices: [], bias: biasRecords(inDev, supply, d.inputBias) },
      load: { device: ldDev, topology: ldTop, devices: [], bias: biasRecords(ldDev, supply, d.loadBias) },
    };
  }
  const inGates = [p.input.devices[0].vgs, ...at.gates.input];
  return {
    input: {
      device: inDev, topology: inTop,
      devices: deviceRecords(inDev, supply, inTop, at.circuit.input.devices, p.input.devices, inGates, sides.input.ctx.ut(at.corner)),
      bias: biasRecords(inDev, supply, d.inputBias),
    },
    load: {
      device: ldDev, topology: ldTop,
      devices: deviceRecords(ldDev, supply, ldTop, at.circuit.load.devices, p.load.devices, at.gates.load, sides.load.ctx.ut(at.corner)),
      bias: biasRecords(ldDev, supply, d.loadBias),
    },
  };
}

function predictedOf(sides: StageSides, d: StageDesign, at: StageAt): StagePredicted {
  const p = at.trace.points[at.trace.j0];
  return {
    gain: at.gain,
    swing: at.trace.swing,
    vlow: at.trace.vlow,
    vhigh: at.trace.vhigh,
    output: sides.stage.output,
    vin: p ? p.vin : 0,
    gbw: at.gbw,
    cout: at.cout,
    area: d.area,
    current: p ? p.i : 0,
  };
}

function curveOf(at: StageAt): StageCurvePoint[] {
  const out: StageCurvePoint[] = [];
  for (const p of at.trace.points) if (p && Number.isFinite(p.gain)) out.push({ vout: p.vout, vin: p.vin, gain: p.gain });
  return out;
}

function verdict(stage: StageSpec, target: StageTarget, at: StageAt | null, corner: string | null): StageVerdict {
  const finite = (x: number | null | undefined): number | null => (x !== null && x !== undefined && Number.isFinite(x) ? x : null);
  if (target === 'gain') return { target, required: stage.gain, achieved: finite(at?.gainAtSwing), at: null, device: null, corner };
  if (target === 'swing') return { target, required: stage.swing, achieved: finite(at?.trace.swing), at: null, device: null, corner };
  if (target === 'gbw') return { target, required: stage.gbw ?? null, achieved: finite(at?.gbw), at: stage.output, device: null, corner };
  if (target === 'vin') {
    const vin = at?.trace.points[at.trace.j0]?.vin;
    const rail = vin === undefined || at === null ? null : vinRail(vin, at.circuit.supply);
    return { target, required: rail, achieved: finite(vin), at: stage.output, device: null, corner };
  }
  return { target, required: null, achieved: null, at: null, device: null, corner };
}

function smallestTarget(m: StageMargins): StageTarget {
  if (m.vin < 0) return 'vin'; // an input outside the rails is no design, whatever else it meets
  const order: Array<keyof StageMargins> = ['swing', 'gain', 'gbw'];
  return order.reduce((a, b) => (m[b] < m[a] ? b : a));
}

/**
 * Why a design misses at one corner, as the summary words it: the input outside the rails; else, when the gain at
 * the design point is below the target (no swing at all), that gain there; else, when no interval of the swing
 * target's width fits the traced output range (the gain held over it reads 0 whatever the gain target), the swing;
 * else the target with the least margin.
 */
function missTarget(stage: StageSpec, m: StageMargins, at: StageAt, corner: string): StageVerdict {
  if (m.vin < 0) return verdict(stage, 'vin', at, corner);
  if (!(at.gain >= stage.gain)) return { target: 'gain', required: stage.gain, achieved: at.gain, at: stage.output, device: null, corner };
  if (!(at.gainAtSwing > 0) && m.swing < 0) return verdict(stage, 'swing', at, corner);
  return verdict(stage, smallestTarget(m), at, corner);
}

function smallest(m: StageMargins): number {
  return Math.min(m.gain, m.swing, m.gbw);
}

/** Per-corner reports, nominal first. */
function cornerResults(sides: StageSides, d: StageDesign): StageCorner[] {
  const stage = sides.stage;
  const all: Array<StageAt | { corner: string; error: string }> = [d.nominal, ...(d.corners ?? [])];
  return all.map((at, k) => {
    const corner = at.corner;
    if ('error' in at) {
      return { corner: at.corner, feasible: false, predicted: emptyPredicted(stage, d.area), gates: { input: [], load: [] }, binding: verdict(stage, 'table', null, corner) };
    }
    const m = stageMargins(stage, at);
    const ok = meets(m);
    const r: StageCorner = {
      corner: at.corner, feasible: ok, predicted: predictedOf(sides, d, at),
      gates: { input: at.gates.input.map((g) => absolute(sides.input.device, sides.supply, g)), load: at.gates.load.map((g) => absolute(sides.load.device, sides.supply, g)) },
    };
    if (ok) r.tightest = verdict(stage, smallestTarget(m), at, corner);
    else r.binding = missTarget(stage, m, at, corner);
    return r;
  });
}

function emptyPredicted(stage: StageSpec, area: number): StagePredicted {
  return { gain: 0, swing: 0, vlow: null, vhigh: null, output: stage.output, vin: 0, gbw: null, cout: null, area, current: 0 };
}

/** Square-law hand analysis beside the table result; undefined when the square-law fit fails. */
function squareLawOf(sides: StageSides, d: StageDesign): StageSquareLaw | undefined {
  const at = d.nominal;
  const p = at.trace.points[at.trace.j0];
  if (!p) return undefined;
  const i = sides.stage.current;
  const check = (top: Topology, devices: readonly StackDevice[], ops: readonly DeviceBias[]) =>
    squareLawCheck(topologyOf(top), devices.map((x) => x.slice), devices.map((x) => x.w), ops, i);
  const ci = check(d.input.cand.topology, at.circuit.input.devices, p.input.devices);
  const cl = check(d.load.cand.topology, at.circuit.load.devices, p.load.devices);
  const gmOf = (vov: number[]) => vov.map((v) => (2 * i) / v);
  const roOf = (lambda: number[]) => lambda.map((l) => 1 / (l * i));
  const gmIn = gmOf(ci.vov);
  const rin = handSideRout(gmIn, roOf(ci.lambda));
  const rload = handSideRout(gmOf(cl.vov), roOf(cl.lambda));
  const s: StageSquareLaw = {
    gain: handStageGain(gmIn[0], rin, rload),
    swing: handSwing(sides.supply, ci.headroom, cl.headroom),
    gm: gmIn[0], rin, rload,
    vov: { input: ci.vov, load: cl.vov },
    headroom: { input: ci.headroom, load: cl.headroom },
  };
  const nums = [s.gain, s.swing, s.gm, s.rin, s.rload, ...s.vov.input, ...s.vov.load];
  return nums.every(Number.isFinite) ? s : undefined;
}

/** Best gain held over the swing target, best swing at the gain target and best gain at the design point over some designs. */
function nearestOf(pool: readonly StageDesign[]): { gainAtSwing: number; swingAtGain: number; peak: number } {
  let gainAtSwing = 0;
  let swingAtGain = 0;
  let peak = 0;
  for (const d of pool) {
    gainAtSwing = Math.max(gainAtSwing, d.nominal.gainAtSwing);
    swingAtGain = Math.max(swingAtGain, d.nominal.trace.swing);
    peak = Math.max(peak, d.nominal.gain);
  }
  return { gainAtSwing, swingAtGain, peak };
}

/**
 * Why nothing met the targets: the nearest points and which target binds, by how much. The nearest points are the
 * climbs' (`climbed`, over the whole allowed space; see stage-refine.ts nearestStage) when the search ran them, else
 * the best over the explored designs.
 */
function infeasibility(sides: StageSides, best: StageDesign, explored: readonly StageDesign[], climbed?: StageNearest): Pick<StageResult, 'binding' | 'nearest'> {
  const stage = sides.stage;
  const nominal = sides.input.ctx.nominal;
  // Only designs with the input DC voltage within the rails count; when there are none, that binds
  // (the shown design is then the one closest to the rails, see pickStage).
  const pool = explored.filter((d) => withinRails(stage, d));
  if (pool.length === 0) {
    const { gainAtSwing, swingAtGain } = nearestOf(explored);
    return { binding: verdict(stage, 'vin', best.nominal, nominal), nearest: { gainAtSwing, swingAtGain, corner: nominal } };
  }
  // The climbs' winners (traced on the reported grid), else the best of the explored designs.
  const { gainAtSwing, swingAtGain, peak } = climbed
    ? { gainAtSwing: climbed.held.nominal.gainAtSwing, swingAtGain: climbed.swing?.nominal.trace.swing ?? 0, peak: climbed.peak.nominal.gain }
    : nearestOf(pool);
  const nearest: NonNullable<StageResult['nearest']> = { gainAtSwing, swingAtGain, corner: nominal };
  if (climbed?.overCorners) nearest.overCorners = climbed.overCorners;
  // Bindings from the nearest points name the best any design reaches (`best`), not the shown design's figure.
  const reach = climbed ? { best: true } : {};
  if (peak < stage.gain) {
    return { binding: { target: 'gain', required: stage.gain, achieved: peak, at: stage.output, device: null, corner: nominal, ...reach }, nearest };
  }
  if (nominalOk(stage, best)) {
    const c = (best.corners ?? []).find((x) => !meets(stageMargins(stage, x)));
    if (c) {
      return { binding: 'error' in c ? verdict(stage, 'table', null, c.corner) : missTarget(stage, stageMargins(stage, c), c, c.corner), nearest };
    }
  }
  const swingOk = pool.filter((d) => d.nominal.trace.swing >= stage.swing - SWING_TOLERANCE);
  if (stage.gbw !== undefined && (climbed ? climbed.gbw !== undefined : swingOk.length > 0)) {
    const g = climbed?.gbw ? climbed.gbw.nominal.gbw ?? 0 : Math.max(...swingOk.map((d) => d.nominal.gbw ?? 0));
    return { binding: { target: 'gbw', required: stage.gbw, achieved: g, at: stage.output, device: null, corner: nominal, ...reach }, nearest };
  }
  // Both targets miss together (gain held over the swing target ⇔ swing at the gain target); the one further off, relatively, binds.
  const g = 1 - gainAtSwing / stage.gain;
  const s = 1 - swingAtGain / stage.swing;
  // No interval of the swing target's width fits the traced output range: the held gain reads 0 for any gain
  // target, so only the swing can bind.
  const binding: StageVerdict = g >= s && (gainAtSwing > 0 || !(swingAtGain > 0))
    ? { target: 'gain', required: stage.gain, achieved: gainAtSwing, at: null, device: null, corner: nominal, ...reach }
    : { target: 'swing', required: stage.swing, achieved: swingAtGain, at: null, device: null, corner: nominal, ...reach };
  return { binding, nearest };
}

/** The report for one load topology: the chosen design, its corners, and why it fails if it does. */
export function stageResult(sides: StageSides, best: StageDesign, pool: readonly StageDesign[], evaluated: number, nearest?: StageNearest): StageResult {
  const stage = sides.stage;
  fineTrace(sides, best);
  const corners = cornerResults(sides, best);
  const feasible = corners.every((c) => c.feasible);
  const { input, load } = sidesOf(sides, best);
  const r: StageResult = {
    name: stage.name, feasible, input, load,
    predicted: predictedOf(sides, best, best.nominal),
    curve: curveOf(best.nominal),
    corners,
    evaluated,
  };
  const sq = squareLawOf(sides, best);
  if (sq) r.squareLaw = sq;
  if (!feasible) Object.assign(r, infeasibility(sides, best, pool, nearest));
  else {
    const all: Array<StageAt | { corner: string; error: string }> = [best.nominal, ...(best.corners ?? [])];
    let worst = best.nominal as StageAt;
    for (const c of all) if (!('error' in c) && smallest(stageMargins(stage, c)) < smallest(stageMargins(stage, worst))) worst = c;
    r.tightest = verdict(stage, smallestTarget(stageMargins(stage, worst)), worst, worst.corner);
  }
  return r;
}

/**
 * A placeholder result when no pair could be realised: `why` 'table' when the tables could not hold a pair's bias,
 * 'saturation' when a side has no design whose lower devices are saturated at the design point (`at`), 'width' when
 * every design of a side has a device wider than the width limit (`width`: the limit and the narrowest widest device).
 */
export function emptyStageResult(
  sides: StageSides, topology: Topology, evaluated: number, why: 'table' | 'saturation' | 'width' = 'table', width?: { wmax: number; narrowest: number },
): StageResult {
  const stage = sides.stage;
  return {
    name: stage.name, feasible: false,
    input: { device: sides.input.device, topology: stage.input.topology, devices: [], bias: [] },
    load: { device: sides.load.device, topology, devices: [], bias: [] },
    predicted: emptyPredicted(stage, 0),
    curve: [],
    // No design to check at any corner; the key is there as on every stage entry (README, JSON output).
    corners: [],
    binding: {
      target: why, required: width?.wmax ?? null, achieved: width?.narrowest ?? null,
      at: why === 'saturation' ? stage.output : null, device: null, corner: sides.input.ctx.nominal,
    },
    nearest: { gainAtSwing: 0, swingAtGain: 0, corner: sides.input.ctx.nominal },
    evaluated,
  };
}

/** One explored design as a point of the trade front. */
export function stageFrontPoint(sides: StageSides, d: StageDesign): StageFrontPoint {
  const side = (s: StageDesign['input']) => s.cand.l.map((l, k) => ({ l, gmid: s.cand.gmid[k], w: s.sized.w[k] }));
  const t = d.nominal.trace;
  return {
    load: d.load.cand.topology,
    gain: d.nominal.gain,
    swing: d.nominal.trace.swing,
    // A search-grid trace's held gain is read off its 50 mV samples, linear across a swing edge: up to half its value
    // low at a steep one, or above the gain target for a window past it. With the solved edges as samples a point
    // shows the gain target held over the swing target exactly when its swing reaches it.
    gainAtSwing: Math.max(d.nominal.heldSolved ? d.nominal.gainAtSwing : 0, gainOverSwingWithEdges(t.vs, t.gains, t.j0, sides.stage.swing, t, sides.stage.gain)),
    area: d.area,
    feasible: nominalOk(sides.stage, d) && (d.corners === undefined ? sides.input.ctx.corners.length === 1 : d.corners.every((c) => meets(stageMargins(sides.stage, c)))),
    devices: { input: side(d.input), load: side(d.load) },
  };
}
