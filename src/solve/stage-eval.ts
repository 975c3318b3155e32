import { StackwrightError } from '../errors.js';
import { topologyOf } from '../topology/index.js';
import type { StageSpec } from '../design/types.js';
import {
  biasDevices, biasGates, gainOverSwing, heldGain, holdingRun, sampleOf, stagePoint, traceStage,
  type BiasDevice, type StackDevice, type StageCircuit, type StagePoint, type StageTrace,
} from '../stack/index.js';
import type { Side, SideDesign, SideKind } from './stage-side.js';
import { rangeSafe } from './evaluate/evaluate.js';

/** Output grid step of the reported trace, V; swing edges are bisected on the circuit to 0.5 mV either way. */
export const TRACE_STEP = 0.02;
/** Coarser grid step of the exact traces while searching, V. */
export const SEARCH_STEP = 0.05;

/** A stage traced at one corner. */
export interface StageAt {
  corner: string;
  circuit: StageCircuit;
  trace: StageTrace;
  /** Gain at the design point (0 when not coverable). */
  gain: number;
  /** Best gain held over the swing target. */
  gainAtSwing: number;
  /** Whether gainAtSwing has its window ends solved on the circuit (heldGain), else it is read off the search grid. */
  heldSolved: boolean;
  gbw: number | null;
  cout: number | null;
  /** Fixed gates (stack coordinates): input cascode gate (if any), load gates. */
  gates: { input: number[]; load: number[] };
}

/** A pair of side designs evaluated exactly as one circuit. */
export interface StageDesign {
  input: SideDesign;
  load: SideDesign;
  inputBias: BiasDevice[];
  loadBias: BiasDevice[];
  area: number;
  nominal: StageAt;
  /** Other corners, filled on demand. */
  corners?: Array<StageAt | { corner: string; error: string }>;
}

/** Sides as the evaluation needs them. */
export interface StageSides {
  stage: StageSpec;
  supply: number;
  input: Side;
  load: Side;
}


/**
 * Output capacitance: drain capacitance (cdd) of the two output devices from
 * their tables at the design point; null when a table lacks it.
 */
function coutOf(circuit: StageCircuit, p: StagePoint | null): number | null {
  if (!p) return null;
  const cdd = (devices: readonly StackDevice[], b: { vgs: number; vds: number; vsb: number }): number => {
    const d = devices[devices.length - 1];
    return d.slice.op(b.vgs, b.vds, b.vsb, d.w).cdd;
  };
  const c = cdd(circuit.input.devices, p.input.devices[p.input.devices.length - 1]) + cdd(circuit.load.devices, p.load.devices[p.load.devices.length - 1]);
  return c > 0 ? c : null;
}

/** GBW = gm_in / (2π (cap + C_out)), C_out left out when the tables lack it; null when no gbw target. */
export function gbwOf(stage: StageSpec, gm: number, cout: number | null): number | null {
  if (stage.gbw === undefined) return null;
  return gm / (2 * Math.PI * ((stage.cap ?? 0) + (cout ?? 0)));
}

/** Trace a circuit and summarise it against the stage targets. */
export function stageAt(sides: StageSides, corner: string, circuit: StageCircuit, gates: StageAt['gates'], step = TRACE_STEP, solveHeld = step < SEARCH_STEP): StageAt {
  const { stage } = sides;
  // A search trace is judged by its figures and the design point; its other solved points would only sit in the
  // pools of traced designs (GC copies them), as the reported curve is traced again (fineTrace). Its samples are kept
  // at the design point and the last grid points inside the swing edges, where a move's swing check (stage-refine
  // surelyMisses) solves nearby.
  const search = step >= SEARCH_STEP;
  const trace = traceStage(circuit, stage.output, stage.gain, { step, keep: search ? 'design' : 'all', swing: solveHeld ? stage.swing : undefined });
  const p = trace.points[trace.j0];
  const cout = coutOf(circuit, p);
  // The search ranks on the grid estimate; reported designs (and the nearest points' climb) have the interval ends
  // solved on the circuit.
  const gainAtSwing = solveHeld ? heldGain(circuit, trace, stage.swing) : gainOverSwing(trace.vs, trace.gains, trace.j0, stage.swing);
  if (search) {
    const { j0 } = trace;
    const { lo, hi } = holdingRun(trace.gains, j0, stage.gain);
    for (let j = 0; j < trace.samples.length; j++) if (j !== j0 && j !== lo && j !== hi) trace.samples[j] = null;
  }
  return {
    corner, circuit, trace, gates,
    gain: trace.gains[trace.j0],
    gainAtSwing,
    heldSolved: solveHeld,
    gbw: p ? gbwOf(stage, p.gm, cout) : null,
    cout,
  };
}

/** Bias diodes of the input cascode gate (low-voltage biasing, as a cascode stack's top diode); none for a common-source input. */
function inputBias(sides: StageSides, d: SideDesign): BiasDevice[] | null {
  if (d.devices.length < 2) return [];
  const ctx = sides.input.ctx;
  const all = biasDevices(topologyOf('cascode'), d.slices, d.sized.gates, ctx.ib, { wmin: ctx.wmin, lengths: ctx.lengths, slice: (l) => ctx.slice(ctx.nominal, l) });
  return all ? [all[1]] : null;
}

/** Bias diodes of every load gate (as the load's stack has them). */
function loadBias(sides: StageSides, d: SideDesign): BiasDevice[] | null {
  const ctx = sides.load.ctx;
  return biasDevices(topologyOf(d.cand.topology), d.slices, d.sized.gates, ctx.ib, { wmin: ctx.wmin, lengths: ctx.lengths, slice: (l) => ctx.slice(ctx.nominal, l) });
}

/** A side design's bias diodes (null: not realisable), worked out once per design: it serves every pair it is in. */
function biasOf(sides: StageSides, kind: SideKind, d: SideDesign): BiasDevice[] | null {
  if (d.bias === undefined) d.bias = rangeSafe(() => (kind === 'input' ? inputBias : loadBias)(sides, d));
  return d.bias;
}

/**
 * Whether a side design's bias diodes can be realised (the tables cover them, each at least the minimum width): a pair
 * with one that cannot is never realised (evaluatePair), so such designs are left out before the pairs are screened.
 */
export function biasRealisable(sides: StageSides, side: StageSides['input'], d: SideDesign): boolean {
  return biasOf(sides, side.kind, d) !== null;
}

/** The circuit of a pair at the nominal corner: each side's devices with the gates of its sizing. */
export function pairCircuit(sides: StageSides, input: SideDesign, load: SideDesign): StageCircuit {
  const loadOps = (load.loadOps ??= new Map());
  return {
    supply: sides.supply, device: sides.input.device,
    input: { devices: input.devices, cascodeGate: input.sized.gates[1] },
    load: { devices: load.devices, gates: load.sized.gates },
    loadOps,
  };
}

/**
 * How a pair is judged: traced on the search grid ('search'); the same with the gain held over the swing target
 * solved on the circuit at the window ends ('held', see heldGain); or solved at the design point only ('point': a
 * one-sample trace with no swing, for climbs on the design-point gain alone, kept out of every pool of traced designs).
 */
export type PairJudge = 'search' | 'held' | 'point';

/** The design point alone, as a one-sample trace (swing 0, nothing held). */
function pointAt(sides: StageSides, corner: string, circuit: StageCircuit, gates: StageAt['gates']): StageAt {
  const p = stagePoint(circuit, sides.stage.output);
  const trace: StageTrace = { vs: Float64Array.of(sides.stage.output), gains: Float64Array.of(p ? p.gain : 0), points: [p], samples: [p && sampleOf(p)], j0: 0, vlow: null, vhigh: null, swing: 0 };
  return { corner, circuit, trace, gates, gain: trace.gains[0], gainAtSwing: 0, heldSolved: false, gbw: null, cout: null };
}

/**
 * Evaluate a pair exactly at the nominal corner: bias diodes for every fixed
 * gate (as stacks have), then the circuit judged as `judge` says. Null when a
 * bias diode cannot be realised.
 */
export function evaluatePair(sides: StageSides, input: SideDesign, load: SideDesign, judge: PairJudge = 'search'): StageDesign | null {
  return rangeSafe(() => {
    const ib = biasOf(sides, 'input', input);
    const lb = biasOf(sides, 'load', load);
    if (!ib || !lb) return null;
    const circuit = pairCircuit(sides, input, load);
    const gates = { input: input.sized.gates.slice(1), load: load.sized.gates };
    const corner = sides.input.ctx.nominal;
    const nominal = judge === 'point' ? pointAt(sides, corner, circuit, gates) : stageAt(sides, corner, circuit, gates, SEARCH_STEP, judge === 'held');
    return { input, load, inputBias: ib, loadBias: lb, area: input.area + load.area, nominal };
  });
}

/**
 * The same sizes at another corner: each fixed gate re-derived from its bias
 * diode there; the input DC voltage is re-solved (feedback holds the output at
 * the design point). An error entry when a bias diode cannot carry its current.
 */
export function evaluateCorner(sides: StageSides, d: StageDesign, corner: string, step = SEARCH_STEP, solveHeld = step < SEARCH_STEP): StageAt | { corner: string; error: string } {
  try {
    const ic = sides.input.ctx;
    const lc = sides.load.ctx;
    const inDevices: StackDevice[] = d.input.cand.l.map((l, k) => ({ slice: ic.slice(corner, l), w: d.input.sized.w[k] }));
    const ldDevices: StackDevice[] = d.load.cand.l.map((l, k) => ({ slice: lc.slice(corner, l), w: d.load.sized.w[k] }));
    const ig = biasGates(d.inputBias, d.inputBias.map((b) => ic.slice(corner, b.l)));
    const lg = biasGates(d.loadBias, d.loadBias.map((b) => lc.slice(corner, b.l)));
    const circuit: StageCircuit = {
      supply: sides.supply, device: sides.input.device,
      input: { devices: inDevices, cascodeGate: ig[0] },
      load: { devices: ldDevices, gates: lg },
    };
    return stageAt(sides, corner, circuit, { input: ig, load: lg }, step, solveHeld);
  } catch (e) {
    if (e instanceof StackwrightError && e.kind === 'range') return { corner, error: e.message };
    throw e;
  }
}

/** Other corners of a design, computed once. */
export function cornersOf(sides: StageSides, d: StageDesign): NonNullable<StageDesign['corners']> {
  d.corners ??= sides.input.ctx.corners.slice(1).map((c) => evaluateCorner(sides, d, c));
  return d.corners;
}

/** Designs whose nominal trace and other corners are on the reported grid already (see setFine). */
const fine = new WeakSet<StageDesign>();

/** Give a design its traces on the reported grid (nominal, every other corner in order), as fineTrace makes them. */
export function setFine(d: StageDesign, nominal: StageAt, corners: NonNullable<StageDesign['corners']>): void {
  d.nominal = nominal;
  d.corners = corners;
  fine.add(d);
}

/** Re-trace a design (nominal and every corner) on the reported grid, for the result, unless it is so traced. */
export function fineTrace(sides: StageSides, d: StageDesign): void {
  if (fine.has(d)) return;
  const nominal = stageAt(sides, d.nominal.corner, d.nominal.circuit, d.nominal.gates, TRACE_STEP);
  setFine(d, nominal, sides.input.ctx.corners.slice(1).map((c) => evaluateCorner(sides, d, c, TRACE_STEP)));
}
