/**
 * Exhaustive reference for the gain-stage sizing tests (objective area): slow and simple, sharing none of the
 * tool's stage search (no side screen, pair screen or climb). Every pair of side designs on a grid — each device's
 * length and gm/ID chosen independently, and every VDS setpoint — is sized with the stack layer (src/stack) and
 * judged by the README's definitions:
 * - each side sized at the design point: the input side's stack voltage and the load's at `output`, each device's
 *   VGS from its gm/ID, W = I/jd, W within [shortest table length, width limit (the spec's, else the kit default
 *   of 64 fingers of 100 × the shortest table length)];
 * - every device below a side's top one has VDS ≥ VDSsat (EKV interpolation) at the design point;
 * - every fixed gate has a realisable bias diode (as `netlist --bias diodes`; a diode too narrow takes a longer L from
 *   the side's allowed lengths, as for stacks); the input gate lies within the rails;
 * - the transfer curve traced on the circuit on the reported 20 mV grid with each swing edge bisected on the circuit
 *   (traceStage); the design meets the targets when the swing at the gain target reaches the swing target, the
 *   input DC voltage at the design point lies within the rails, and with a gbw target the GBW at the design point
 *   (gm_in / (2π (cap + C_out)), C_out the tables' cdd of the two output devices) reaches it.
 * Pairs are judged in order of area, so the first pair meeting the targets is the smallest on the grid. The only
 * skip is exact: a pair whose gain at the design point (one solve of the circuit) is below the target has no swing.
 * The nearest points (stageNearestExhaustive) judge pairs by the same definitions; the gain held over the swing target
 * is exact on the circuit (the highest gain whose swing, each edge bisected on the circuit, reaches the target; found by
 * bisection on the gain), not read off the 20 mV curve.
 */
import type { LengthSlice } from '../../src/device/types.js';
import type { KitAccess } from '../../src/solve/kit.js';
import type { StageSpec, Topology } from '../../src/design/types.js';
import type { Polarity } from '../../src/table/types.js';
import { topologyOf } from '../../src/topology/index.js';
import {
  biasDevices, inputAtCurrent, sampleAt, saturationVoltage, sideVoltage, sizeStackDevices, stagePoint, thermalVoltage, traceStage,
  stageSample, type StageCircuit, type StageSample, type StageTrace, type StackDevice,
} from '../../src/stack/index.js';

/** How far below its target a swing still meets it, V: every swing check of these references. */
const SWING_SLACK = 1e-9;

export interface StageGrid {
  /** gm/ID points per device over the side's allowed range (ends included). */
  gmidPoints: number;
  /** Setpoint step, V (from 50 mV up to the side's stack voltage less 150 mV). */
  vStep: number;
}

export interface StageRefDesign {
  input: { l: number[]; gmid: number[]; setpoints: number[]; w: number[] };
  load: { l: number[]; gmid: number[]; setpoints: number[]; w: number[] };
  area: number;
  swing: number;
}

export interface StageRefAnswer {
  best?: StageRefDesign;
  /** Side designs on the grid passing the per-side rules, input and load. */
  sides: [number, number];
  /** Pairs traced in full before the answer. */
  traced: number;
}

interface SideOption {
  l: number[];
  gmid: number[];
  setpoints: number[];
  devices: StackDevice[];
  gates: number[];
  area: number;
  /** At the design point: the side's output resistance, Ω, and (input side) the input device's gm, S. */
  rout: number;
  gm: number;
}

const defaultGmidRange: [number, number] = [3, 30];

/** Every side design on the grid passing the per-side rules (see the module comment). */
function sideOptions(stage: StageSpec, kit: KitAccess, supply: number, corner: string, grid: StageGrid, kind: 'input' | 'load', device: Polarity, topology: Topology): SideOption[] {
  const spec = stage[kind];
  const table = Array.from(kit.lengths(corner, device));
  const wmin = table[0];
  const wmax = 64 * 100 * wmin;
  const lengths = table.filter((l) => l >= (spec.l?.min ?? 0) * (1 - 1e-9) && l <= (spec.l?.max ?? Infinity) * (1 + 1e-9));
  const [gLo, gHi] = spec.gmid ? [spec.gmid.min, spec.gmid.max] : defaultGmidRange;
  const gmids = range(gLo, gHi, grid.gmidPoints);
  const vd = sideVoltage(device, supply, stage.output);
  const ut = thermalVoltage(kit.temperature?.(corner, device) ?? 27);
  const slices = new Map<number, LengthSlice>();
  const slice = (l: number) => {
    let s = slices.get(l);
    if (!s) slices.set(l, (s = kit.slice(corner, device, l)));
    return s;
  };
  const shape = topologyOf(topology);
  const n = shape.roles.length;
  const setpointLists: number[][] = [];
  for (let k = 0; k < shape.setpoints; k++) {
    const list: number[] = [];
    for (let v = 0.05; v <= vd - 0.15 + 1e-9; v += grid.vStep) list.push(Math.round(v * 1e6) / 1e6);
    setpointLists.push(list);
  }
  const ib = spec.biasCurrent ?? stage.current;
  const out: SideOption[] = [];
  for (const l of cartesian(Array.from({ length: n }, () => lengths))) {
    for (const gmid of cartesian(Array.from({ length: n }, () => gmids))) {
      for (const setpoints of cartesian(setpointLists)) {
        const sl = l.map(slice);
        let sized;
        try {
          sized = sizeStackDevices({ shape, slices: sl, gmid, setpoints, current: stage.current, vmid: vd, wmin });
        } catch {
          continue;
        }
        if (!sized || sized.w.some((w) => !(w <= wmax))) continue;
        // Saturation of every device below the top one at the design point.
        let saturated = true;
        for (let k = 0; k < n - 1; k++) {
          if (sized.nodes[k + 1] - sized.nodes[k] < saturationVoltage(sl[k], gmid[k], sized.nodes[k], ut)) saturated = false;
        }
        if (!saturated) continue;
        if (kind === 'input' && !(sized.gates[0] <= supply)) continue;
        // Bias diodes: every fixed gate (the input's cascode gate; every load gate). A common-source input has none.
        if (kind === 'load' || n > 1) {
          let biased: boolean;
          try {
            biased = biasDevices(kind === 'input' ? topologyOf('cascode') : shape, sl, sized.gates, ib, { wmin, lengths, slice }) !== null;
          } catch {
            biased = false;
          }
          if (!biased) continue;
        }
        const devices = sl.map((s, k) => ({ slice: s, w: sized.w[k] }));
        let rout = 0;
        let gm = 0;
        try {
          if (kind === 'input') {
            const op = inputAtCurrent(devices, n > 1 ? sized.gates[1] : undefined, vd, stage.current);
            if (op) [rout, gm] = [op.rout, op.devices[0].gm];
          } else {
            const s = sampleAt(devices, Array.from(sized.gates), vd);
            if (s.op) rout = s.rout;
          }
        } catch {
          continue;
        }
        if (!(rout > 0)) continue;
        out.push({ l, gmid, setpoints, devices, gates: Array.from(sized.gates), area: devices.reduce((a, d) => a + d.w * d.slice.l, 0), rout, gm });
      }
    }
  }
  return out;
}


function range(lo: number, hi: number, points: number): number[] {
  return Array.from({ length: points }, (_, j) => lo + ((hi - lo) * j) / (points - 1));
}

function cartesian<T>(lists: T[][]): T[][] {
  return lists.reduce<T[][]>((acc, list) => acc.flatMap((a) => list.map((x) => [...a, x])), [[]]);
}

/** One case of the stage reference tests: a stage spec on a demo kit, the reference's grid, and why the case is there. */
export interface StageCase {
  id: string;
  kit: 'demo180' | 'demo090';
  stage: Omit<StageSpec, 'name'>;
  grid: StageGrid;
  why: string;
}

/** A stage spec for the reference tests: 10 µA, objective area, one length and gm/ID range per side (the load's own lengths when given). */
export function stageOf(p: {
  gain: number; swing: number; output: number; input: 'n' | 'p'; inputTopology: 'single' | 'cascode';
  load: 'single' | 'cascode' | 'cascode-stacked' | 'triple'; l: [number, number]; gmid: [number, number]; loadL?: [number, number];
}): Omit<StageSpec, 'name'> {
  const side = (l: [number, number]) => ({ l: { min: l[0], max: l[1] }, gmid: { min: p.gmid[0], max: p.gmid[1] } });
  return {
    current: 10e-6, gain: p.gain, swing: p.swing, output: p.output, objective: 'area',
    input: { device: p.input, topology: p.inputTopology, ...side(p.l) },
    load: { topology: p.load, ...side(p.loadL ?? p.l) },
  } as Omit<StageSpec, 'name'>;
}

function circuitOf(supply: number, device: Polarity, a: SideOption, b: SideOption): StageCircuit {
  return {
    supply, device,
    input: { devices: a.devices, cascodeGate: a.devices.length > 1 ? a.gates[1] : undefined },
    load: { devices: b.devices, gates: b.gates },
  };
}

/** Exhaustive smallest-area design of one stage spec with a fixed load topology, at one corner. */
export function stageExhaustive(stage: StageSpec, kit: KitAccess, supply: number, corner: string, grid: StageGrid): StageRefAnswer {
  const inDev = stage.input.device;
  const ldDev: Polarity = inDev === 'n' ? 'p' : 'n';
  const loadTopology = stage.load.topology as Topology;
  if (loadTopology === 'auto') throw new Error('the reference takes one load topology');

  const inputs = sideOptions(stage, kit, supply, corner, grid, 'input', inDev, stage.input.topology as Topology).sort((a, b) => a.area - b.area);
  const loads = sideOptions(stage, kit, supply, corner, grid, 'load', ldDev, loadTopology).sort((a, b) => a.area - b.area);
  // Pairs in order of summed area without listing them all: a heap holding, per input, its next load.
  const heap = new PairHeap(inputs.map((a) => a.area), loads.map((b) => b.area));
  let traced = 0;
  for (let next = heap.pop(); next; next = heap.pop()) {
    const [area, i, j] = next;
    const a = inputs[i];
    const b = loads[j];
    // Gain at the design point from each side's values there (both sides sit at their sizing bias): below the
    // target (with 1 % for solver tolerance, then checked on the circuit) there is no swing at that gain.
    if (a.gm * ((a.rout * b.rout) / (a.rout + b.rout)) < 0.99 * stage.gain) continue;
    const circuit = circuitOf(supply, inDev, a, b);
    let p;
    try {
      p = stagePoint(circuit, stage.output);
    } catch {
      continue;
    }
    if (!p || !(p.gain >= stage.gain)) continue;
    traced++;
    let t;
    try {
      t = traceStage(circuit, stage.output, stage.gain, { step: 0.02, swing: stage.swing });
    } catch {
      continue;
    }
    const vin = t.points[t.j0]?.vin;
    if (vin === undefined || vin < 0 || vin > supply) continue;
    if (t.swing >= stage.swing - SWING_SLACK && stage.gbw !== undefined && !(gbwAt(stage, circuit, t.points[t.j0]) >= stage.gbw)) continue;
    if (t.swing >= stage.swing - SWING_SLACK) {
      const side = (o: SideOption) => ({ l: o.l, gmid: o.gmid, setpoints: o.setpoints, w: o.devices.map((d) => d.w) });
      return { best: { input: side(a), load: side(b), area, swing: t.swing }, sides: [inputs.length, loads.length], traced };
    }
  }
  return { sides: [inputs.length, loads.length], traced };
}

export interface StageNearestAnswer {
  /** Highest gain at the design point over the grid's pairs (input DC voltage within the rails). */
  peak: number;
  /**
   * Highest gain held over the swing target, exact on the circuit (heldExact): over the grid's pairs, the highest gain
   * G whose swing at G (the README's: the run of 20 mV samples from the design point with gain ≥ G, each edge bisected
   * on the circuit) reaches the swing target.
   */
  held: number;
  /** The same figure read off each pair's 20 mV curve (heldOnGrid, linear between samples): reads low where the gain falls steeply. */
  heldGrid: number;
  /** Widest swing at the gain target (0 when no pair reaches the gain target at the design point). */
  swing: number;
  /** Highest gain at the design point among the pairs meeting the targets (swing at the gain target ≥ the swing target); 0 when none does. */
  gainMeeting: number;
  /**
   * With a gbw target: the highest GBW among the pairs meeting gain and swing, by the README's definition
   * gm_in / (2π (cap + C_out)), C_out the tables' cdd of the two output devices at the design point; 0 when none.
   */
  gbwMeeting: number;
  pairs: number;
  traced: number;
  /** Traced pairs judged on the circuit for the held gain (heldExact: a bisected swing at the best so far, and where that holds the bisection on the gain). */
  exact: number;
  /** The pair holding `held`. */
  heldBy?: { input: Pick<SideOption, 'l' | 'gmid' | 'setpoints'>; load: Pick<SideOption, 'l' | 'gmid' | 'setpoints'> };
}

/** Gain held over `width` on a sampled curve: max over windows containing the design point of the min gain (linear between samples). */
export function heldOnGrid(vs: ArrayLike<number>, gains: ArrayLike<number>, j0: number, width: number): number {
  const n = vs.length;
  const at = (v: number): number => {
    let k = 0;
    while (k < n - 2 && vs[k + 1] < v) k++;
    const t = Math.min(Math.max((v - vs[k]) / (vs[k + 1] - vs[k]), 0), 1);
    return gains[k] + t * (gains[k + 1] - gains[k]);
  };
  let best = 0;
  // Windows with one end on a sample, and a fine sweep of the window's start in between.
  const starts: number[] = [];
  for (let j = 0; j < n; j++) starts.push(vs[j], vs[j] - width);
  for (let a = vs[j0] - width; a <= vs[j0] + 1e-12; a += 0.001) starts.push(a);
  for (const a of starts) {
    const b = a + width;
    if (a < vs[0] - 1e-12 || b > vs[n - 1] + 1e-12 || a > vs[j0] + 1e-12 || b < vs[j0] - 1e-12) continue;
    let m = Math.min(at(a), at(b));
    for (let j = 0; j < n; j++) if (vs[j] > a && vs[j] < b) m = Math.min(m, gains[j]);
    best = Math.max(best, m);
  }
  return best;
}

/** Resolution of a swing edge bisected for the exact held gain, V. */
const EDGE_RES = 1e-7;
/** Relative resolution of the held gain's bisection. */
const GAIN_RES = 1e-6;

/**
 * Upper bound on the exact held gain of a traced curve, from its 20 mV samples alone: the swing at a gain G is the
 * run of samples from the design point with gain ≥ G, each edge bisected between the run's last sample and the next
 * one out, so it reaches `width` only if the run's outer neighbours (the grid's ends where the run reaches them) lie
 * `width` apart, and G is at most the run's lowest sample. The bound is the best such run's lowest sample.
 */
export function heldBound(vs: ArrayLike<number>, gains: ArrayLike<number>, j0: number, width: number): number {
  const n = vs.length;
  let best = 0;
  for (let lo = j0; lo >= 0; lo--) {
    let m = Infinity;
    for (let j = lo; j < j0; j++) m = Math.min(m, gains[j]);
    for (let hi = j0; hi < n; hi++) {
      m = Math.min(m, gains[hi]);
      if (!(m > best)) break;
      const span = (hi < n - 1 ? vs[hi + 1] : vs[n - 1]) - (lo > 0 ? vs[lo - 1] : vs[0]);
      if (span >= width - SWING_SLACK) {
        best = m;
        break;
      }
    }
  }
  return best;
}

/** A point solved on the circuit inside one 20 mV gap, `x` its distance from the gap's inner sample, V. */
interface GapPoint {
  x: number;
  gain: number;
  s: StageSample | null;
}

/**
 * One pair's traced curve and its circuit, for swings at any gain: the points solved inside each gap between samples
 * are kept, so each new gain's edge bisection starts from the points already known (its bracket is the last known
 * point holding the gain, counted outwards from the gap's inner sample, and the first one not).
 */
class HeldCurve {
  private gaps = new Map<number, GapPoint[]>();
  constructor(private readonly c: StageCircuit, readonly t: StageTrace) {}

  /** Swing at gain g by the README's definition (see StageNearestAnswer.held); 0 when the design point misses g. */
  swingAt(g: number): number {
    const { vs, gains, j0 } = this.t;
    const n = vs.length;
    if (!(gains[j0] >= g)) return 0;
    let lo = j0;
    while (lo > 0 && gains[lo - 1] >= g) lo--;
    let hi = j0;
    while (hi < n - 1 && gains[hi + 1] >= g) hi++;
    const vlow = lo > 0 ? this.edge(lo, -1, g) : vs[0];
    const vhigh = hi < n - 1 ? this.edge(hi, 1, g) : vs[n - 1];
    return vhigh - vlow;
  }

  /** The edge between sample j (gain ≥ g) and sample j + d (below g), bisected on the circuit to EDGE_RES: the last point holding g. */
  private edge(j: number, d: 1 | -1, g: number): number {
    const { vs, gains, samples } = this.t;
    const key = 2 * j + (d > 0 ? 1 : 0);
    let pts = this.gaps.get(key);
    if (!pts) {
      pts = [{ x: 0, gain: gains[j], s: samples[j] }, { x: Math.abs(vs[j + d] - vs[j]), gain: gains[j + d], s: samples[j + d] }];
      this.gaps.set(key, pts);
    }
    for (;;) {
      let i = 0;
      while (i + 1 < pts.length && pts[i + 1].gain >= g) i++;
      // The outer sample below g (the run stopped there), so i + 1 exists.
      const a = pts[i];
      const b = pts[i + 1];
      if (b.x - a.x <= EDGE_RES) return vs[j] + d * a.x;
      const x = 0.5 * (a.x + b.x);
      const s = stageSample(this.c, vs[j] + d * x, a.s?.load, a.s ?? undefined);
      pts.splice(i + 1, 0, { x, gain: s ? s.gain : 0, s });
    }
  }

  meets(g: number, width: number): boolean {
    return this.swingAt(g) >= width - SWING_SLACK;
  }
}

/**
 * Exact held gain of one traced pair over `width` (StageNearestAnswer.held): the highest gain g whose swing at g reaches
 * `width`, bisected on g. A higher g gives a narrower or equal swing — its run of samples is within the lower g's, and
 * each edge, bisected in the same gap, is a crossing of the higher gain, nearer the design point where the gain is
 * monotone between samples — so the gains that reach `width` are an interval from 0. `above` is heldBound's bound
 * (reached: the answer); with `floor` > 0 a pair whose swing at `floor` misses `width` is skipped (-1: it cannot hold
 * more than floor).
 */
function heldExact(curve: HeldCurve, width: number, above: number, floor: number): number {
  if (!(above > 0)) return 0;
  if (curve.meets(above, width)) return above;
  let lo = floor;
  if (floor > 0 && !curve.meets(floor, width)) return -1;
  let hi = above;
  for (let k = 0; k < 60 && hi - lo > GAIN_RES * hi; k++) {
    const m = 0.5 * (lo + hi);
    if (curve.meets(m, width)) lo = m;
    else hi = m;
  }
  return lo;
}

/**
 * Exact held gain over `width` of one traced circuit (as StageNearestAnswer.held, for a single design), for references
 * that trace their own designs; `t` from traceStage on `c` with every sample kept (keep 'all', the default).
 */
export function heldOnCircuit(c: StageCircuit, t: StageTrace, width: number): number {
  return Math.max(0, heldExact(new HeldCurve(c, t), width, heldBound(t.vs, t.gains, t.j0, width), 0));
}

/**
 * Exhaustive nearest points of one stage spec with a fixed load topology, at one corner: over every pair of side
 * designs on the grid (input DC voltage at the design point within the rails), the highest gain at the design
 * point, the highest gain held over the swing target (exact on the circuit, see `held`), the widest swing at the gain
 * target, and the highest gain at the design point among the pairs meeting the targets (the optima of objectives swing
 * and gain). Pairs go in order of their design-point gain from the two sides' values there (within 1 % of the
 * circuit's, which is then solved); each figure stops once that order cannot beat it (held and swing both need the
 * design-point gain). The held gain is bisected on the circuit (heldExact) only for the traced pairs whose grid bound
 * (heldBound) exceeds the best held so far, in order of that bound, and only after a bisected swing at that best
 * shows the pair holds at least as much; the pairs traced are those whose design-point gain could beat the grid
 * reading, then (when the exact best is below it) those that could beat the exact best.
 */
export function stageNearestExhaustive(stage: StageSpec, kit: KitAccess, supply: number, corner: string, grid: StageGrid): StageNearestAnswer {
  const inDev = stage.input.device;
  const ldDev: Polarity = inDev === 'n' ? 'p' : 'n';
  const loadTopology = stage.load.topology as Topology;
  if (loadTopology === 'auto') throw new Error('the reference takes one load topology');
  const inputs = sideOptions(stage, kit, supply, corner, grid, 'input', inDev, stage.input.topology as Topology);
  const loads = sideOptions(stage, kit, supply, corner, grid, 'load', ldDev, loadTopology);
  const nl = loads.length;
  const est = new Float64Array(inputs.length * nl);
  for (let i = 0; i < inputs.length; i++) {
    const a = inputs[i];
    for (let j = 0; j < nl; j++) est[i * nl + j] = a.gm * ((a.rout * loads[j].rout) / (a.rout + loads[j].rout));
  }
  const order = Array.from(est.keys()).sort((x, y) => est[y] - est[x]);
  const circuit = (k: number) => circuitOf(supply, inDev, inputs[Math.floor(k / nl)], loads[k % nl]);
  const withinRails = (vin: number | undefined) => vin !== undefined && vin >= 0 && vin <= supply;
  const trace = (c: StageCircuit) => traceStage(c, stage.output, stage.gain, { step: 0.02, swing: stage.swing });
  let peak = 0;
  for (const k of order) {
    if (est[k] < peak / 1.02) break;
    let p;
    try {
      p = stagePoint(circuit(k), stage.output);
    } catch {
      continue;
    }
    if (p && withinRails(p.vin) && p.gain > peak) peak = p.gain;
  }
  let heldGrid = 0;
  let held = 0;
  let swing = 0;
  let traced = 0;
  let exact = 0;
  let heldBy: StageNearestAnswer['heldBy'];
  let gainMeeting = 0;
  let gbwMeeting = 0;
  // Traced pairs (within the rails) that may hold more than the exact best: their grid bound.
  let open: Array<{ k: number; bound: number }> = [];
  let next = 0;
  // Trace pairs in order while one could beat `least` (the grid reading's best, then the exact best).
  const traceOn = (least: () => number) => {
    for (; next < order.length; next++) {
      const k = order[next];
      const needSwing = est[k] >= 0.98 * stage.gain;
      if (!needSwing && est[k] < least() / 1.02) break;
      const c = circuit(k);
      let t;
      try {
        t = trace(c);
      } catch {
        continue;
      }
      traced++;
      if (!withinRails(t.points[t.j0]?.vin)) continue;
      heldGrid = Math.max(heldGrid, heldOnGrid(t.vs, t.gains, t.j0, stage.swing));
      const bound = heldBound(t.vs, t.gains, t.j0, stage.swing);
      if (bound > held) open.push({ k, bound });
      swing = Math.max(swing, t.swing);
      if (t.swing >= stage.swing - SWING_SLACK) {
        gainMeeting = Math.max(gainMeeting, t.gains[t.j0]);
        if (stage.gbw !== undefined) gbwMeeting = Math.max(gbwMeeting, gbwAt(stage, c, t.points[t.j0]));
      }
    }
  };
  // The exact held gain of the open pairs, best bound first, until no bound beats the exact best.
  const settle = () => {
    open.sort((x, y) => y.bound - x.bound);
    for (const { k, bound } of open) {
      if (!(bound > held)) break;
      const c = circuit(k);
      const h = heldExact(new HeldCurve(c, trace(c)), stage.swing, bound, held);
      exact++;
      if (h > held) {
        held = h;
        const pick = (o: SideOption) => ({ l: o.l, gmid: o.gmid, setpoints: o.setpoints });
        heldBy = { input: pick(inputs[Math.floor(k / nl)]), load: pick(loads[k % nl]) };
      }
    }
    open = [];
  };
  traceOn(() => heldGrid);
  settle();
  // Soundness: every pair whose design-point gain could exceed the exact best is traced.
  while (next < order.length && !(est[order[next]] < held / 1.02)) {
    traceOn(() => held);
    settle();
  }
  return { peak, held, heldGrid, swing, gainMeeting, gbwMeeting, pairs: est.length, traced, exact, heldBy };
}

/**
 * GBW at the design point by the README's definition gm_in / (2π (cap + C_out)), C_out the tables' cdd of the two
 * output devices there; 0 without a design point.
 */
function gbwAt(stage: StageSpec, c: StageCircuit, p: ReturnType<typeof traceStage>['points'][number] | undefined): number {
  if (!p) return 0;
  const top = (devices: readonly StackDevice[], b: { vgs: number; vds: number; vsb: number }) => devices[devices.length - 1].slice.op(b.vgs, b.vds, b.vsb, devices[devices.length - 1].w).cdd;
  const cout = top(c.input.devices, p.input.devices[p.input.devices.length - 1]) + top(c.load.devices, p.load.devices[p.load.devices.length - 1]);
  return p.gm / (2 * Math.PI * ((stage.cap ?? 0) + (cout > 0 ? cout : 0)));
}

/** Min-heap of pairs (i, j) by a[i] + b[j] (both ascending): starts with (i, 0) for every i; popping (i, j) adds (i, j + 1). */
class PairHeap {
  private keys: number[] = [];
  private is: number[] = [];
  private js: number[] = [];
  constructor(private readonly a: number[], private readonly b: number[]) {
    if (b.length > 0) a.forEach((_, i) => this.push(i, 0));
  }
  private push(i: number, j: number): void {
    let k = this.keys.length;
    this.keys.push(this.a[i] + this.b[j]);
    this.is.push(i);
    this.js.push(j);
    while (k > 0) {
      const up = (k - 1) >> 1;
      if (this.keys[up] <= this.keys[k]) break;
      this.swap(k, up);
      k = up;
    }
  }
  pop(): [number, number, number] | undefined {
    if (this.keys.length === 0) return undefined;
    const out: [number, number, number] = [this.keys[0], this.is[0], this.js[0]];
    const last = this.keys.length - 1;
    this.swap(0, last);
    this.keys.pop();
    this.is.pop();
    this.js.pop();
    for (let k = 0; ; ) {
      const l = 2 * k + 1;
      const r = l + 1;
      let m = k;
      if (l < this.keys.length && this.keys[l] < this.keys[m]) m = l;
      if (r < this.keys.length && this.keys[r] < this.keys[m]) m = r;
      if (m === k) break;
      this.swap(k, m);
      k = m;
    }
    if (out[2] + 1 < this.b.length) this.push(out[1], out[2] + 1);
    return out;
  }
  private swap(x: number, y: number): void {
    [this.keys[x], this.keys[y]] = [this.keys[y], this.keys[x]];
    [this.is[x], this.is[y]] = [this.is[y], this.is[x]];
    [this.js[x], this.js[y]] = [this.js[y], this.js[x]];
  }
}
