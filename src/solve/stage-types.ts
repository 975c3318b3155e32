import type { Polarity } from '../table/types.js';
import type { InputTopology, Topology } from '../design/types.js';
import type { BiasResult, DeviceResult } from './types.js';
import type { Verdict } from './evaluate/verdict.js';

/** Targets a stage verdict can name. */
export type StageTarget = 'gain' | 'swing' | 'gbw' | 'saturation' | 'table' | 'vin' | 'width';

/**
 * Why a stage fails (`binding`) or what it meets with the least margin
 * (`tightest`), as data in SI units, shaped like a stack's verdict; sentences
 * are made in src/report. `required`: gain (V/V), swing (V), gbw (Hz), for `vin`
 * (input DC voltage outside the rails) the rail it crosses (0 V or the supply), null when
 * not applicable, for `width` the width limit (m); `achieved`: what the nearest (or chosen) design reaches, null
 * when nothing was reachable; `at`: the output voltage it refers to (the design
 * point for gain and gbw) or null; `device`: always null (a stage target is not
 * one device's); `corner`: the corner where it was found.
 */
export interface StageVerdict extends Omit<Verdict, 'target'> {
  target: StageTarget;
  /**
   * True on an infeasible stage's binding when `achieved` is the best any allowed design reaches (a nearest point,
   * climbed for over the whole design space), not the shown design's own figure.
   */
  best?: boolean;
}

/** One side of a sized stage. Devices bottom (rail) first; the input device's `gate` is the input DC voltage. */
export interface StageSide {
  device: Polarity;
  topology: InputTopology | Topology;
  devices: DeviceResult[];
  /** Diodes that produce the fixed gates (none for the input gate itself). */
  bias: BiasResult[];
}

export interface StagePredicted {
  /** Gain magnitude gm_in·(Rout_in ∥ Rout_load) at the design point. */
  gain: number;
  /** vhigh − vlow, V (0 when the design point misses the gain target). */
  swing: number;
  vlow: number | null;
  vhigh: number | null;
  /** Design-point output voltage, V. */
  output: number;
  /** Input DC voltage at the design point, V. */
  vin: number;
  /** gm_in / (2π (cap + C_out)), Hz; null when no gbw target was asked. */
  gbw: number | null;
  /** Output-node capacitance of the two output devices from the tables (cdd), F; null when the tables lack it. */
  cout: number | null;
  /** ΣW·L of both sides' output devices, m² (bias devices apart). */
  area: number;
  /** Current through both sides at the design point, A. */
  current: number;
}

export interface StageCurvePoint {
  vout: number;
  vin: number;
  gain: number;
}

export interface StageCorner {
  corner: string;
  feasible: boolean;
  predicted: StagePredicted;
  /** Fixed gate voltages the bias diodes produce at this corner (absolute, V), per side. */
  gates: { input: number[]; load: number[] };
  binding?: StageVerdict;
  tightest?: StageVerdict;
}

/** Square-law hand analysis of the sized stage (to compare with the table result). */
export interface StageSquareLaw {
  /** gm_in·(R_in ∥ R_load) with gm = 2I/Vov and ro = 1/(λI). */
  gain: number;
  /** supply − Σ VDSsat (rule-of-thumb headroom of each side), V. */
  swing: number;
  gm: number;
  rin: number;
  rload: number;
  vov: { input: number[]; load: number[] };
  headroom: { input: number; load: number };
}

export interface StageResult {
  name: string;
  feasible: boolean;
  /** With load topology 'auto': true on the load topology the objective prefers. */
  chosen?: boolean;
  input: StageSide;
  load: StageSide;
  predicted: StagePredicted;
  curve: StageCurvePoint[];
  binding?: StageVerdict;
  tightest?: StageVerdict;
  /** Infeasible: best gain held over the swing target, best swing at the gain target, over the explored designs. */
  /**
   * Nearest points at the nominal corner (`corner`); with several corners also `overCorners`, the same two figures
   * with each design judged at its worst corner.
   */
  nearest?: { gainAtSwing: number; swingAtGain: number; corner: string; overCorners?: { gainAtSwing: number; swingAtGain: number } };
  squareLaw?: StageSquareLaw;
  corners?: StageCorner[];
  /** Combinations screened plus designs evaluated exactly. */
  evaluated: number;
}

/** One exactly evaluated stage design on the trade front. */
export interface StageFrontPoint {
  load: Topology;
  /** Gain at the design point. */
  gain: number;
  /** Swing at the stage's gain target, V. */
  swing: number;
  /** Best gain held over the swing target. */
  gainAtSwing: number;
  area: number;
  feasible: boolean;
  /** Per side, devices from the rail outwards. */
  devices: { input: Array<{ l: number; gmid: number; w: number }>; load: Array<{ l: number; gmid: number; w: number }> };
}
