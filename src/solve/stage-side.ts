import { StackwrightError } from '../errors.js';
import { REL_TOL } from '../policy.js';
import { topologyOf } from '../topology/index.js';
import type { LengthSlice } from '../device/types.js';
import type { Polarity } from '../table/types.js';
import type { StackSpec, StageSpec, Topology } from '../design/types.js';
import {
  sampleAt, sideVoltage, sizeStackDevices, solveInput, solved,
  type BiasDevice, type SizedStack, type StackDevice, type StackOp,
} from '../stack/index.js';
import type { KitAccess } from './kit.js';
import { makeContext, type SolveContext } from './context.js';
import { screen } from './search/screen.js';
import type { Candidate } from './search/candidate.js';
import { CandidateMap } from './search/candidate-map.js';
import { EDGE_STEPS } from './search/width-edge.js';
import { edgeOf } from '../numeric/index.js';
import { midPoint } from './evaluate/stack-eval.js';
import { saturationMargin } from './evaluate/checks.js';
import { rangeSafe } from './evaluate/evaluate.js';

export type SideKind = 'input' | 'load';

/**
 * Shares of the free voltage (supply − swing) a side's screen is asked to live
 * with as headroom: two (more for some sides: sharesOf), so each side's pools span the headroom/Rout trade.
 */
const SHARES: Record<SideKind, number[]> = { input: [0.35, 0.6], load: [0.35, 0.6] };
/**
 * A side facing a one-device side (common-source input, single load), which needs only its device's VDSsat, is
 * also screened with nearly all and with all of the free voltage (the gain can hold a little past a side's
 * saturation edge): the smallest pairs then often have this side at high setpoints and low gm/ID.
 */
const ROOMY_SHARES = [0.9, 1];
/** How far the room the leanest input leaves must exceed the load's largest share to be screened on its own, V. */
const ROOM_MIN = 0.02;
/**
 * How far above the gain target every screened load design alone must cap the gain (with the input of the highest
 * gm) for the load to be screened with all its headroom too (see spareRout).
 */
const SPARE_ROUT = 10;
/**
 * SPARE_ROUT for a load without setpoints (a stacked cascode): its headroom is set by its gm/IDs alone, so the smallest
 * pairs spend less spare Rout on it (both devices at the bottom gm/ID, saturated only at the design point), and its
 * screen with all the headroom costs one screen (no split of the headroom among setpoints).
 */
const SPARE_ROUT_FIXED = 4;
/**
 * How far below its design stack voltage a side's roomy screen puts its headroom, V: a design needs its devices
 * saturated at the design point only, and a load with Rout to spare is often smallest right at that edge (a stacked
 * cascode at the bottom gm/ID), past the 50 mV the other screens keep from it.
 */
const ROOMY_EDGE = 0.01;
/** A middling input gm/ID, 1/V: the derived Rout target of a side screen assumes it (see sideRout). */
const MIDDLING_GMID = 12;

/** The Rout each side needs for the gain target when the two are equal: 2·gain/gm_in at MIDDLING_GMID, Ω. */
function sideRout(stage: StageSpec): number {
  return (2 * stage.gain) / (MIDDLING_GMID * stage.current);
}

/** The shares a side is screened with (see SHARES, ROOMY_SHARES). */
function sharesOf(stage: StageSpec, kind: SideKind): number[] {
  const other = kind === 'load' ? stage.input.topology : stage.load.topology;
  return other === 'single' ? [...SHARES[kind], ...ROOMY_SHARES] : SHARES[kind];
}

/** One side of a stage as a stack search: its polarity, design stack voltage and the stack context it screens with. */
export interface Side {
  kind: SideKind;
  device: Polarity;
  /** Stack voltage of this side at the design point, V. */
  vd: number;
  ctx: SolveContext;
  /** Over the side designs refused for a device wider than the width limit: the narrowest of their widest devices, m. */
  narrowestTooWide?: number;
}

/** A side sized at the design point, with its small-signal curve on the stage's output grid. */
export interface SideDesign {
  cand: Candidate;
  slices: LengthSlice[];
  sized: SizedStack;
  devices: StackDevice[];
  area: number;
  /**
   * Rout of the side at each grid output (input side: carrying the design current; load: fixed gates); 0 where not
   * coverable. Empty for a side sized without its curve (the stage climb, which traces its pairs exactly).
   */
  rout: Float64Array;
  /** Input side only: gm of the input device at each grid output at the design current, S. */
  gm?: Float64Array;
  /** Drain capacitance of the side's output (top) device at the design point, F (NaN when the table lacks it). */
  cdd: number;
  /** Load side: its operating points at the nominal corner by output voltage, for every pair it is in (StageCircuit.loadOps). */
  loadOps?: Map<number, StackOp | null>;
  /** Its bias diodes at the nominal corner once worked out (null: not realisable), for every pair it is in (stage-eval biasOf). */
  bias?: BiasDevice[] | null;
}

// The derived stack spec places mid-span at the design point: vmid = (headroom + span)/2 = vd.
function sideSpec(stage: StageSpec, kind: SideKind, device: Polarity, vd: number, headroom: number, rout: number): StackSpec {
  const s = stage[kind];
  const spec: StackSpec = {
    name: `${stage.name}.${kind}`, device, current: stage.current, rout, headroom, span: 2 * vd - headroom, objective: 'area',
    topology: kind === 'input' ? stage.input.topology : stage.load.topology,
  };
  if (s.l) spec.l = s.l;
  if (s.gmid) spec.gmid = s.gmid;
  if (s.biasCurrent !== undefined) spec.biasCurrent = s.biasCurrent;
  return spec;
}

/** Headroom a side may be asked for in its screen: above 0 and below its design stack voltage, with the span inside the supply. */
function headroomRange(vd: number, supply: number): [number, number] {
  return [Math.max(0.05, 2 * vd - supply + 0.01), vd - 0.05];
}

/** The stack context of one side; throws an input error naming the stage when the output leaves no room for it. */
export function makeSide(stage: StageSpec, kind: SideKind, kit: KitAccess, supply: number, corners: string[]): Side {
  const device: Polarity = kind === 'input' ? stage.input.device : stage.input.device === 'n' ? 'p' : 'n';
  const vd = sideVoltage(device, supply, stage.output);
  const [lo, hi] = headroomRange(vd, supply);
  if (!(hi > lo)) {
    throw new StackwrightError(`output ${stage.output} V leaves the ${kind} side (${device}-type) no room to operate within the ${supply} V supply`, { where: `stage "${stage.name}".output` });
  }
  // Errors name the stage side's own keys (e.g. stage "amp".input.l), not the stack spec derived from it.
  const ctx = makeContext(sideSpec(stage, kind, device, vd, 0.5 * (lo + hi), 1e6), kit, supply, corners, `stage "${stage.name}".${kind}`);
  return { kind, device, vd, ctx };
}

/**
 * Candidates for one side: the stack screen run with derived targets — the
 * side's share of the voltage the swing target leaves (supply − swing), and
 * the Rout each side needs for the gain target when the two are equal
 * (2·gain/gm_in at a middling gm/ID) — so its pools hold designs across the
 * headroom/Rout/area trade. A one-device side (common-source input, single load) is enumerated whole: one derived
 * Rout target drops the short, low-Rout devices the smallest pairs often have (the other side making up the gain),
 * and there are only lengths × gm/ID values. `roomy`: screened with all the headroom the side may have at once.
 */
export function sideCandidates(stage: StageSpec, side: Side, topology: Topology, supply: number, roomy = false): Candidate[] {
  if (topology === 'single') return singleCandidates(side);
  if (roomy) return screenAt(side, topology, sideRout(stage), side.vd - ROOMY_EDGE);
  const free = Math.max(supply - stage.swing, 0.1);
  const [lo, hi] = headroomRange(side.vd, supply);
  const rout = sideRout(stage);
  const seen = new CandidateMap<Candidate>();
  const add = (cands: readonly Candidate[]) => {
    for (const c of cands) seen.set(seen.key(c), c);
  };
  for (const share of sharesOf(stage, side.kind)) add(screenAt(side, topology, rout, Math.min(Math.max(share * free, lo), hi)));
  // The input side's gain is gm·Rout, its gm set by the input device's gm/ID: at the top of the range it needs the
  // least Rout, and a stack screen ranking by area alone never proposes it (a higher gm/ID only costs width). Such
  // inputs, at their least headroom, leave the load the most room, which the smallest pairs often spend on a long
  // load at low gm/ID: screened once more with the Rout target at the top gm/ID and the least headroom allowed.
  // That screen still gives its input device the lowest gm/ID meeting the Rout (by area), less gm than the target
  // assumed: its designs also with the input device at the top gm/ID, whose gain lets the smallest pairs have a
  // shorter load.
  if (side.kind === 'input') {
    const top = side.ctx.gmids[side.ctx.gmids.length - 1];
    const lean = screenAt(side, topology, (2 * stage.gain) / (top * stage.current), lo);
    add(lean);
    add(lean.map((c) => inputAtTop(side, c)));
  }
  // A wide swing target can leave a share too small for any design of the topology (a triple's lower devices
  // need their VDSsat each) although the stage still holds its gain past the load's saturation edge: then the
  // side is screened with all the headroom it may have, and the traced pairs say what the stage reaches.
  if (seen.size === 0) add(screenAt(side, topology, rout, hi));
  return [...seen.values()];
}

/** An input-side candidate with its input device (the bottom) at the top of the side's gm/ID range. */
export function inputAtTop(side: Side, c: Candidate): Candidate {
  return { topology: c.topology, l: c.l, gmid: [side.ctx.gmids[side.ctx.gmids.length - 1], ...c.gmid.slice(1)], setpoints: c.setpoints };
}

/** The stack screen of one side with derived targets: Rout `rout`, headroom `h` and the span to match; the side's own spec is kept. */
function screenAt(side: Side, topology: Topology, rout: number, h: number): Candidate[] {
  const ctx = side.ctx;
  const base = ctx.spec;
  try {
    ctx.spec = { ...base, rout, headroom: h, span: 2 * side.vd - h };
    return screen(ctx, topology);
  } finally {
    ctx.spec = base;
  }
}

/**
 * True when every load design has far more Rout at the design point than the gain needs: with the input of the
 * highest gm (`gmMax`) it alone caps the gain above SPARE_ROUT (SPARE_ROUT_FIXED) × the target. The smallest pairs then spend the spare
 * Rout on headroom, the load's devices at low gm/ID run past their saturation edge (the top one over a high setpoint
 * below it, or a stacked cascode's pair at low gm/ID, which has no setpoint to trade), which no share's screen
 * proposes (each keeps every device saturated within its share). The derived target sideRout does not tell: a
 * screen held by its headroom share gives loads far above it whenever the share forces high gm/ID.
 */
export function spareRout(stage: StageSpec, loads: readonly SideDesign[], j0: number, gmMax: number): boolean {
  if (loads.length === 0) return false;
  const need = ((loads[0].cand.setpoints.length === 0 ? SPARE_ROUT_FIXED : SPARE_ROUT) * stage.gain) / gmMax;
  return loads.every((d) => d.rout[j0] > need);
}

/**
 * The room one input design leaves the load: the free voltage less the least stack voltage the input needs below
 * the output for its own gain (gm·Rout of the side alone, above any pair's) to reach the target, read off its curve
 * on the output grid. Undefined unless that is more than the load's largest share gave it (by ROOM_MIN): such an
 * input (high gm/ID, low setpoint) lets the load spend the rest on a long device at low gm/ID.
 */
export function roomLeft(input: Side, d: SideDesign, vs: Float64Array, j0: number, stage: StageSpec, supply: number): number | undefined {
  const gm = d.gm as Float64Array;
  const holds = (j: number) => j >= 0 && j < vs.length && gm[j] * d.rout[j] >= stage.gain;
  if (!holds(j0)) return undefined;
  // Towards a lower input stack voltage: down the output grid for an n input, up for a p input.
  const dir = input.device === 'n' ? -1 : 1;
  let j = j0;
  while (holds(j + dir)) j += dir;
  const free = Math.max(supply - stage.swing, 0.1);
  const room = free - sideVoltage(input.device, supply, vs[j]);
  return room > Math.max(...sharesOf(stage, 'load')) * free + ROOM_MIN ? room : undefined;
}

/**
 * A stacked-cascode load's candidates screened with `room` as its headroom (see roomLeft). Its headroom is set by
 * its devices' gm/ID alone (VGS of the bottom one, VDSsat of the top), with no setpoint to trade, so the screens at
 * the shares never reach its low-gm/ID designs. Loads with setpoints are not screened so: their screens grow with
 * the headroom (every split of it among the setpoints), for a cost the demo's auto load would pay on each topology.
 */
export function roomCandidates(stage: StageSpec, side: Side, topology: Topology, supply: number, room: number): Candidate[] {
  if (topology !== 'cascode-stacked') return [];
  const [lo, hi] = headroomRange(side.vd, supply);
  return screenAt(side, topology, sideRout(stage), Math.min(Math.max(room, lo), hi));
}

/**
 * A one-device side's candidates: every table length × gm/ID (an input's also halfway between the grid's), and for
 * each length whose lowest realisable grid gm/ID has an unrealisable one below it (narrower than the minimum width,
 * at a fixed current W falls with gm/ID), the lowest gm/ID it reaches, bisected between the two: that length's
 * smallest device, with its highest Rout, which the smallest pair may need (the grid point above it misses the gain,
 * the one below is too narrow).
 */
function singleCandidates(side: Side): Candidate[] {
  const ctx = side.ctx;
  const one = (l: number, g: number): Candidate => ({ topology: 'single', l: [l], gmid: [g], setpoints: [] });
  const fits = (l: number, g: number): boolean =>
    rangeSafe(() => sizeStackDevices({ shape: topologyOf('single'), slices: [ctx.slice(ctx.nominal, l)], gmid: [g], setpoints: [], current: ctx.spec.current, vmid: side.vd, wmin: ctx.wmin })) !== null;
  const out: Candidate[] = [];
  for (const l of ctx.lengths) {
    for (const g of ctx.gmids) out.push(one(l, g));
    // A common-source input's gm/ID sets its gm, so the stage's gain, in steps of several percent; the smallest pair,
    // holding the gain and swing with little to spare, often has it between the grid points: also the midpoints
    // (the climb's halved steps move one side at a time, and the load must move with it).
    if (side.kind === 'input') for (let k = 1; k < ctx.gmids.length; k++) out.push(one(l, 0.5 * (ctx.gmids[k - 1] + ctx.gmids[k])));
    const j = ctx.gmids.findIndex((g) => fits(l, g));
    if (j >= 1) out.push(one(l, edgeOf((g) => fits(l, g), ctx.gmids[j], ctx.gmids[j - 1], EDGE_STEPS)));
  }
  return out;
}

/** A side candidate sized at the design point (widths, gates, area), its operating point there not yet checked (sideChecked). */
export type SideSized = Pick<SideDesign, 'cand' | 'slices' | 'sized' | 'devices' | 'area'>;

/**
 * Size a side candidate at the design point. Null when the table cannot realise it, a device is narrower than the
 * minimum width, or wider than the width limit (the narrowest such is recorded in `side.narrowestTooWide`).
 */
export function sideSized(side: Side, cand: Candidate): SideSized | null {
  const ctx = side.ctx;
  ctx.count.exact++;
  return rangeSafe(() => {
    const slices = cand.l.map((l) => ctx.slice(ctx.nominal, l));
    const sized = sizeStackDevices({ shape: topologyOf(cand.topology), slices, gmid: cand.gmid, setpoints: cand.setpoints, current: ctx.spec.current, vmid: side.vd, wmin: ctx.wmin });
    if (!sized) return null;
    // No output device wider than the width limit, as for stacks (the screen proposes wider ones when none fits).
    const widest = Math.max(...sized.w);
    if (!(widest <= ctx.wmax * (1 + REL_TOL))) {
      side.narrowestTooWide = Math.min(side.narrowestTooWide ?? Infinity, widest);
      return null;
    }
    const devices: StackDevice[] = slices.map((slice, k) => ({ slice, w: sized.w[k] }));
    return { cand, slices, sized, devices, area: devices.reduce((a, x) => a + x.w * x.slice.l, 0) };
  });
}

/**
 * A sized side as a side design without its curve (rout and gm left empty): null when the table cannot cover its
 * design point or a device below the top one is not saturated there (as for stacks).
 */
export function sideChecked(side: Side, s: SideSized): SideDesign | null {
  return checkedAt(side, s)?.d ?? null;
}

/** sideChecked with the operating point at the design point (where the load's curve starts from). */
function checkedAt(side: Side, s: SideSized): { d: SideDesign; mid: StackOp } | null {
  const ctx = side.ctx;
  return rangeSafe(() => {
    const { devices, sized } = s;
    const m = midPoint(devices, sized.gates, side.vd, { i: ctx.spec.current, nodes: sized.nodes }, ctx.ut(ctx.nominal));
    if (!m || saturationMargin(m) < 0) return null;
    const top = m.mid.devices[devices.length - 1];
    const cdd = devices[devices.length - 1].slice.op(top.vgs, top.vds, top.vsb, devices[devices.length - 1].w).cdd;
    return { d: { cand: s.cand, slices: s.slices, sized, devices, area: s.area, rout: new Float64Array(0), cdd }, mid: m.mid };
  });
}

/**
 * Size a side candidate at the design point and trace its small-signal curve
 * on the output grid `vs`. Null when sideSized or sideChecked refuses it. `gmMax` (load side) is the
 * highest input gm over the input designs, to know where the load alone caps the gain.
 * (sideSized and sideChecked alone give a side checked at the design point without its curve.)
 */
export function sideDesign(side: Side, cand: Candidate, vs: Float64Array, j0: number, stage: StageSpec, supply: number, gmMax = Infinity): SideDesign | null {
  const s = sideSized(side, cand);
  const checked = s && checkedAt(side, s);
  if (!checked) return null;
  const { d, mid } = checked;
  const ctx = side.ctx;
  const { devices, sized } = d;
  return rangeSafe(() => {
    const n = vs.length;
    const rout = (d.rout = new Float64Array(n));
    // Beyond the point where this side alone caps the gain below half the target
    // (A ≤ gm_in·Rout_side), the stage is outside any swing: stop tracing that way.
    const floor = 0.5 * stage.gain;
    if (side.kind === 'input') {
      const gm = new Float64Array(n);
      // Each solve starts its root searches from the neighbour towards the design point (its x1 and input gate);
      // the answers are read from `solved`, so no operating point is copied out per point.
      let x1: number | undefined;
      let gate: number | undefined;
      const at = (j: number): boolean => {
        if (!solveInput(devices, sized.gates[1], sideVoltage(side.device, supply, vs[j]), ctx.spec.current, x1, gate)) return false;
        x1 = solved.x1;
        gate = solved.gate;
        rout[j] = solved.rout;
        gm[j] = solved.devices[0].gm;
        return gm[j] * solved.rout >= floor;
      };
      let start: [number | undefined, number | undefined] = [undefined, undefined];
      for (let j = j0; j < n && at(j); j++) if (j === j0) start = [x1, gate];
      [x1, gate] = start;
      for (let j = j0 - 1; j >= 0 && at(j); j--);
      d.gm = gm;
    } else {
      const at = (j: number, guess: StackOp | undefined): StackOp | null => {
        const v = sideVoltage(side.device, supply, vs[j]);
        if (!(v > 0)) return null;
        const s = sampleAt(devices, sized.gates, v, guess);
        rout[j] = s.op && s.rout > 0 ? s.rout : 0;
        return s.op && gmMax * rout[j] >= floor ? s.op : null;
      };
      let g: StackOp | null = mid;
      for (let j = j0; j < n && g; j++) g = at(j, g);
      g = mid;
      for (let j = j0 - 1; j >= 0 && g; j--) g = at(j, g);
    }
    return d;
  });
}
