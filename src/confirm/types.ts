import type { BiasResult, Role } from '../solve/types.js';

/** One point of a simulated sweep with Rout from it (magnitudes, SI; rout Infinity where the current does not rise). */
export interface SimulatedPoint {
  /** Stack voltage, V. */
  v: number;
  iout: number;
  rout: number;
}

/** What ngspice shows for one design at one corner, measured as the README defines each figure. */
export interface SimulatedFigures {
  corner: string;
  /** Output current at mid-span, A. */
  iout: number;
  /** Lowest Rout over [max(spec headroom, simulated headroom), span], Ω. */
  rout: number;
  /** Lowest Rout over [spec headroom, span], Ω: what decides a Rout miss. */
  routAtTarget: number;
  /** Lowest stack voltage where the targets hold up to span, V (Infinity when never). */
  headroom: number;
  /** The simulated curve at the predicted curve's resolution (65 points over [0, span]). */
  curve: SimulatedPoint[];
}

/** Simulated figures at the nominal corner, with every corner's (nominal first). */
export interface Simulated extends SimulatedFigures {
  corners: SimulatedFigures[];
}

/** Stacks miss iout, rout or headroom; gain stages miss gain (at the design point), swing or gbw. */
export type MissTarget = 'iout' | 'rout' | 'headroom' | 'gain' | 'swing' | 'gbw';

/**
 * A target simulation does not meet, shaped like the solver's verdict objects:
 * data in SI units, null where a value does not apply or is never reached;
 * sentences come from src/report.
 */
export interface Miss {
  target: MissTarget;
  /** The spec's value (SI). */
  required: number;
  /** What simulation shows (SI); null for a headroom never reached, or a GBW whose gain never falls to 1 in the AC band. */
  achieved: number | null;
  /** Stack voltage where it was measured, V: mid-span for the current, the lowest Rout's place for Rout. */
  at: number | null;
  device: null;
  corner: string;
}

/** A device of a corrected design: the sizes a user would draw, and the gate its bias diode gives at the nominal corner. */
export interface CorrectedDevice {
  role: Role;
  w: number;
  l: number;
  gate: number;
}

/** The design after simulated correction (or tightening). */
export interface CorrectedDesign {
  devices: CorrectedDevice[];
  bias: BiasResult[];
  /** Output-stack area ΣW·L, m². */
  area: number;
  /** What the tables predict for the corrected design at the nominal corner. */
  predicted: { iout: number; rout: number; headroom: number };
}

/** The outcome of confirming one design in simulation. */
export interface Confirmation {
  name: string;
  /** Figures of the last design simulated (the corrected one when correction ran). */
  simulated: Simulated;
  confirmed: boolean;
  /** ngspice rounds this design took part in (1 = the table design met every target). */
  rounds: number;
  /** Present when correction or tightening changed the design. */
  corrected?: CorrectedDesign;
  /** Targets still missed after the last round (empty when confirmed). */
  misses: Miss[];
  /** True when `tighten` shrank a confirmed design and simulation confirmed the smaller one. */
  tightened?: boolean;
}
