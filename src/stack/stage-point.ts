import { StackwrightError } from '../errors.js';
import type { Polarity } from '../table/types.js';
import type { DeviceBias, StackDevice, StackOp } from './types.js';
import { routAt } from './rout.js';
import { solveNear } from './curve.js';
import { solveInput, solved, solvedOp, type InputGuess } from './stage-input.js';

/**
 * A gain stage as one circuit: the input side (its input gate free) and the
 * load side (gates fixed) share the output node between the two rails.
 * Gates are in each side's stack coordinates (n: from ground, p: from the supply).
 */
export interface StageCircuit {
  supply: number;
  /** Polarity of the input side; the load is the other type. */
  device: Polarity;
  input: { devices: StackDevice[]; cascodeGate?: number };
  load: { devices: StackDevice[]; gates: number[] };
  /**
   * The load's operating points by output voltage (null: not coverable), shared by every circuit with this very
   * load: the load's stack fixes the current whatever the input side, so a climb moving the input side alone solves
   * the load once per output voltage.
   */
  loadOps?: Map<number, StackOp | null>;
}

/** One point of the transfer curve. */
export interface StagePoint {
  /** Output voltage to ground, V. */
  vout: number;
  /** Input gate voltage to ground that holds the output there, V. */
  vin: number;
  /** Current through both sides (set by the load), A. */
  i: number;
  /** Small-signal gain magnitude gm_in·(Rout_in ∥ Rout_load). */
  gain: number;
  gm: number;
  rin: number;
  rload: number;
  input: { nodes: number[]; devices: DeviceBias[] };
  load: StackOp;
}

/** Stack voltage of a side whose rail is the supply (p) or ground (n), at output voltage vout. */
export function sideVoltage(device: Polarity, supply: number, vout: number): number {
  return device === 'n' ? vout : supply - vout;
}

/**
 * Transfer-curve point at `vout`: the load's stack fixes the current; the
 * input side must carry it at its stack voltage, which fixes the input gate.
 * A = gm_in·(Rout_in ∥ Rout_load), Rout_in with the input gate at AC ground.
 * Null where the table cannot cover the point (no input voltage holds vout there).
 * The guesses (solutions nearby) only speed up the solves.
 */
export function stagePoint(c: StageCircuit, vout: number, loadGuess?: StackOp, inputGuess?: InputGuess): StagePoint | null {
  const op = loadAtOutput(c, vout, loadGuess);
  if (op === null) return null;
  const gain = gainAtLoad(c, vout, op, inputGuess);
  if (gain === null) return null;
  const inp = solvedOp(c.input.devices.length, sideVoltage(c.device, c.supply, vout));
  return {
    vout,
    vin: c.device === 'n' ? inp.gate : c.supply - inp.gate,
    i: op.i,
    gain,
    gm: inp.devices[0].gm, rin: inp.rout, rload: routAt(op),
    input: { nodes: inp.nodes, devices: inp.devices },
    load: op,
  };
}

/**
 * stagePoint's gain alone (null where it gives null), with nothing allocated for the input side: for checks that
 * read only the gain at many outputs.
 */
export function stageGain(c: StageCircuit, vout: number, loadGuess?: StackOp, inputGuess?: InputGuess): number | null {
  const op = loadAtOutput(c, vout, loadGuess);
  return op === null ? null : gainAtLoad(c, vout, op, inputGuess);
}

/**
 * A solved point reduced to what a solve nearby starts from (its load's operating point, the input side's x1 and
 * gate: an InputGuess itself) and its gain, the same as stagePoint's: for traces that keep few of their points.
 */
export interface StageSample extends InputGuess {
  gain: number;
  load: StackOp;
}

/** stagePoint as a StageSample (null where it gives null): none of the input side's devices are copied. */
export function stageSample(c: StageCircuit, vout: number, loadGuess?: StackOp, inputGuess?: InputGuess): StageSample | null {
  const op = loadAtOutput(c, vout, loadGuess);
  if (op === null) return null;
  const gain = gainAtLoad(c, vout, op, inputGuess);
  return gain === null ? null : { x1: solved.x1, gate: solved.gate, gain, load: op };
}

/** The sample of a solved point. */
export function sampleOf(p: StagePoint): StageSample {
  return { x1: p.input.nodes[1], gate: p.input.devices[0].vgs, gain: p.gain, load: p.load };
}

/** stagePoint's gain with the load's operating point solved (the input side's answer left in `solved`). */
function gainAtLoad(c: StageCircuit, vout: number, op: StackOp, inputGuess?: InputGuess): number | null {
  const vi = sideVoltage(c.device, c.supply, vout);
  if (!solveInput(c.input.devices, c.input.cascodeGate, vi, op.i, inputGuess?.x1, inputGuess?.gate)) return null;
  const rload = routAt(op);
  const gm = solved.devices[0].gm;
  const par = parallel(solved.rout, rload);
  if (!(par > 0) || !(gm > 0)) return null;
  return gm * par;
}

/**
 * The load's operating point at output voltage vout, from the circuit's memo when it has one; null where either side
 * has no stack voltage there or the table cannot cover the load.
 */
function loadAtOutput(c: StageCircuit, vout: number, guess?: StackOp): StackOp | null {
  const vl = sideVoltage(c.device === 'n' ? 'p' : 'n', c.supply, vout);
  if (!(vl > 0) || !(sideVoltage(c.device, c.supply, vout) > 0)) return null;
  let op = c.loadOps?.get(vout);
  if (op === undefined) {
    op = loadAt(c, vl, guess);
    c.loadOps?.set(vout, op);
  }
  return op;
}

/** The load's operating point at stack voltage vl; null where the table cannot cover it. */
function loadAt(c: StageCircuit, vl: number, guess?: StackOp): StackOp | null {
  try {
    return solveNear(c.load.devices, c.load.gates, vl, guess);
  } catch (e) {
    if (e instanceof StackwrightError && e.kind === 'range') return null;
    throw e;
  }
}

/** r1 ∥ r2, with an infinite resistance leaving the other. */
export function parallel(r1: number, r2: number): number {
  if (!Number.isFinite(r1)) return r2;
  if (!Number.isFinite(r2)) return r1;
  return (r1 * r2) / (r1 + r2);
}
