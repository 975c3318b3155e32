import type { Polarity } from '../table/types.js';
import type { OperatingPoint } from '../device/types.js';
import type { Topology } from '../topology/types.js';
import type { Role, SquareLawCheck } from '../stack/types.js';
import type { Verdict } from './evaluate/verdict.js';
import type { StageResult } from './stage-types.js';

export type { Role, SquareLawCheck };

/**
 * A sized device of the output stack: the operating-point record (device layer) without capacitances, plus
 * its role, absolute gate voltage and VDSsat. Voltages are magnitudes except `gate`.
 */
export interface DeviceResult extends Omit<OperatingPoint, 'cgg' | 'cgs' | 'cgd' | 'cdd'> {
  role: Role;
  /** Absolute gate voltage to ground, V. */
  gate: number;
  /** Table-derived saturation voltage at mid-span (EKV interpolation from gm/ID), V. */
  vdsat?: number;
}

/** A diode-connected device that produces one gate voltage. */
export interface BiasResult {
  /** Which output-stack gate it drives. */
  drives: Role;
  w: number;
  l: number;
  current: number;
  /** Absolute gate voltage to ground it produces, V. */
  voltage: number;
  /** Stacked on another bias device (cascode-stacked), by index in `bias`. */
  stackedOn?: number;
}

export interface CurvePoint {
  /** Stack voltage, V. */
  v: number;
  /** Output node voltage to ground, V. */
  vout: number;
  iout: number;
  rout: number;
}

export interface Predicted {
  /** Output current at mid-span, A. */
  iout: number;
  /** Lowest Rout over [headroom, span], Ω. */
  rout: number;
  /** Lowest stack voltage where the targets hold, V (Infinity when never). */
  headroom: number;
  /** Sum of W·L of the output-stack devices, m². */
  area: number;
  /** Sum of W·L of the bias devices, m². */
  biasArea: number;
  /** 1-sigma output current mismatch (fraction), when the kit has Pelgrom coefficients. */
  sigma?: number;
}

export interface CornerResult {
  corner: string;
  feasible: boolean;
  predicted: Predicted;
  /** Gate voltages the bias devices produce at this corner, V. */
  gates: number[];
  /** Why this corner fails (infeasible corners only). */
  binding?: Verdict;
  /** The constraint with the least margin (feasible corners only). */
  tightest?: Verdict;
}

export interface StackResult {
  name: string;
  device: Polarity;
  topology: Topology;
  feasible: boolean;
  /** When infeasible: the target that binds (at the corner named in it). */
  binding?: Verdict;
  /** When feasible: the constraint with the least margin over all corners. */
  tightest?: Verdict;
  /**
   * Nearest feasible points when infeasible, at the nominal corner (`corner`); with several corners also
   * `overCorners`, the same two figures with each design judged at its worst corner.
   */
  nearest?: { headroomAtRout?: number; routAtHeadroom?: number; corner?: string; overCorners?: { headroomAtRout: number; routAtHeadroom: number } };
  devices: DeviceResult[];
  bias: BiasResult[];
  predicted: Predicted;
  curve: CurvePoint[];
  squareLaw?: SquareLawCheck;
  corners?: CornerResult[];
  /** Candidates evaluated for this stack. */
  evaluated: number;
  /** With topology 'auto': true on the topology picked by the objective. */
  chosen?: boolean;
  /** Present when the target current is above what the tables carry through one device at the width limit: that current, A. */
  currentLimit?: number;
  /** Widest allowed output device, m (spec `wmax` or the kit's default). */
  wmax?: number;
}

export interface SizeResult {
  kit: string;
  corners: string[];
  supply: number;
  caution: string;
  stacks: StackResult[];
  /** Gain stages, one entry per load topology tried (present when the spec has stages). */
  stages?: StageResult[];
}

export const CAUTION =
  'Sizes are first-cut estimates from lookup tables. Verify them by simulation with the foundry models across all corners, mismatch and temperature before any tape-out, following your design team\'s sign-off practice.';
