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
 */
import type { LengthSlice } from '../../src/device/types.js';
import type { KitAccess } from '../../src/solve/kit.js';
import type { StageSpec, Topology } from '../../src/design/types.js';
import type { Polarity } from '../../src/table/types.js';
import { topologyOf } from '../../src/topology/index.js';
import {
  biasDevices, inputAtCurrent, sampleAt, saturationVoltage, sideVoltage, sizeStackDevices, stagePoint, thermalVoltage, traceStage,
  type StageCircuit, type StackDevice,
} from '../../src/stack/index.js';

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
    if (t.swing >= stage.swing - 1e-9 && stage.gbw !== undefined && !(gbwAt(stage, circuit, t.points[t.j0]) >= stage.gbw)) continue;
    if (t.swing >= stage.swing - 1e-9) {
      const side = (o: SideOption) => ({ l: o.l, gmid: o.gmid, setpoints: o.setpoints, w: o.devices.map((d) => d.w) });
      return { best: { input: side(a), load: side(b), area, swing: t.swing }, sides: [inputs.length, loads.length], traced };
    }
  }
  return { sides: [inputs.length, loads.length], traced };
}

export interface StageNearestAnswer {
  /** Highest gain at the design point over the grid's pairs (input DC voltage within the rails). */
  peak: number;
  /** Highest gain held over the swing target: over output intervals of the target's width containing the design point, the lowest gain (linear between the 20 mV samples). */
  held: number;
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

/**
 * Exhaustive nearest points of one stage spec with a fixed load topology, at one corner: over every pair of side
 * designs on the grid (input DC voltage at the design point within the rails), the highest gain at the design
 * point, the highest gain held over the swing target, the widest swing at the gain target, and the highest gain at the
 * design point among the pairs meeting the targets (the optima of objectives swing and gain). Pairs go in order of
 * their design-point gain from the two sides' values there (within 1 % of the circuit's, which is then solved);
 * each figure stops once that order cannot beat it (held and swing both need the design-point gain).
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
  let held = 0;
  let swing = 0;
  let traced = 0;
  let heldBy: StageNearestAnswer['heldBy'];
  let gainMeeting = 0;
  let gbwMeeting = 0;
  for (const k of order) {
    const needSwing = est[k] >= 0.98 * stage.gain;
    if (!needSwing && est[k] < held / 1.02) break;
    const c = circuit(k);
    let t;
    try {
      t = traceStage(c, stage.output, stage.gain, { step: 0.02, swing: stage.swing });
    } catch {
      continue;
    }
    traced++;
    if (!withinRails(t.points[t.j0]?.vin)) continue;
    const h = heldOnGrid(t.vs, t.gains, t.j0, stage.swing);
    if (h > held) {
      held = h;
      const pick = (o: SideOption) => ({ l: o.l, gmid: o.gmid, setpoints: o.setpoints });
      heldBy = { input: pick(inputs[Math.floor(k / nl)]), load: pick(loads[k % nl]) };
    }
    swing = Math.max(swing, t.swing);
    if (t.swing >= stage.swing - 1e-9) {
      gainMeeting = Math.max(gainMeeting, t.gains[t.j0]);
      if (stage.gbw !== undefined) gbwMeeting = Math.max(gbwMeeting, gbwAt(stage, c, t.points[t.j0]));
    }
  }
  return { peak, held, swing, gainMeeting, gbwMeeting, pairs: est.length, traced, heldBy };
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
