import type { BiasResult, DeviceResult } from '../solve/types.js';
import type { Miss } from './types.js';

/** One point of a simulated stage transfer curve (SI). */
export interface StageSimulatedPoint {
  vout: number;
  vin: number;
  /** |dvout/dvin| there; 0 where the output cannot be held. */
  gain: number;
}

/** What ngspice shows for one gain stage at one corner. */
export interface StageSimulatedFigures {
  corner: string;
  /** |dvout/dvin| at the design-point output voltage. */
  gain: number;
  /** Ends of the widest interval around the design point with gain ≥ target, V; null when the design point misses the gain. */
  vlow: number | null;
  vhigh: number | null;
  /** vhigh − vlow, V (0 when the design point misses the gain). */
  swing: number;
  /** Input DC voltage at the design point, V. */
  vin: number;
  /**
   * Unity-gain frequency of the open-loop gain |vout/vin| at the design point with the load capacitance on the
   * output (AC analysis), Hz; 0 when the gain is below 1 from the lowest frequency simulated; null when the stage
   * has no gbw target, or its gain does not fall to 1 within the simulated band (AC_FROM … AC_TO).
   */
  gbw: number | null;
  /** The simulated transfer curve, every 20 mV of output over the range the stage can hold. */
  curve: StageSimulatedPoint[];
  /**
   * With a gbw target: the open-loop gain |vout/vin| against frequency at the design point with the load capacitance
   * on the output, as the AC analysis gives it (20 points a decade); empty without one.
   */
  response: StageResponsePoint[];
}

/** One frequency of a stage's simulated small-signal response. */
export interface StageResponsePoint {
  /** Frequency, Hz. */
  f: number;
  /** |v(out)/v(inp)| there. */
  gain: number;
}

/** Nominal corner's figures on top, every corner's below (nominal first). */
export interface StageSimulated extends StageSimulatedFigures {
  corners: StageSimulatedFigures[];
}

/** A side of a corrected stage: the widths as simulated. */
export interface CorrectedSide {
  devices: Array<Pick<DeviceResult, 'role' | 'w' | 'l'>>;
  bias: BiasResult[];
}

/** The stage after simulated correction. */
export interface CorrectedStage {
  input: CorrectedSide;
  load: CorrectedSide;
  /** ΣW·L of both sides' output devices, m². */
  area: number;
}

/** The outcome of confirming one gain stage in simulation. */
export interface StageConfirmation {
  name: string;
  simulated: StageSimulated;
  confirmed: boolean;
  rounds: number;
  /** Present when correction or tightening changed the design. */
  corrected?: CorrectedStage;
  misses: Miss[];
  /** True when `tighten` shrank a confirmed stage and simulation confirmed the smaller one. */
  tightened?: boolean;
}
