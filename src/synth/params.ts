/**
 * Parameter types of the synthetic EKV-style model behind the invented
 * "Larkspur Microsystems" demo kits (fictional foundry, not a real process).
 */
import type { Polarity } from '../table/types.js';

/** One device type of one kit at nominal process; SI units, magnitudes. */
export interface DeviceParams {
  /** Long-channel threshold at VSB = 0, VDS = 0, V. */
  vt0: number;
  /** Body-effect coefficient γ, √V. */
  gamma: number;
  /** Surface potential in inversion (2ΦF), V. */
  phi: number;
  /** Low-field mobility at the tt corner, m²/(V·s). */
  mu0: number;
  /** Equivalent oxide thickness, m. */
  tox: number;
  /** Vertical-field mobility degradation, 1/V (0 turns it off). */
  theta: number;
  /** Saturation velocity, m/s (Infinity turns velocity saturation off). */
  vsat: number;
  /** DIBL coefficient at L = lmin, V/V (0 turns it off). */
  dibl: number;
  /** Length where `dibl` applies, m; DIBL scales as (lmin/L)². */
  lmin: number;
  /** Early voltage per metre of channel length, V/m (Infinity turns CLM off). */
  vaPerLength: number;
  /** Gate overlap capacitance per side per width, F/m. */
  cov: number;
  /** Drain junction capacitance per width at zero bias, F/m. */
  cj: number;
  /** Junction built-in potential, V, and grading coefficient. */
  pb: number;
  mj: number;
}

/** Process/temperature corner; the shifts are invented and fold in temperature. */
export interface CornerDef {
  temperature: number;
  /** Threshold shift added to vt0, V. */
  dvt: number;
  /** Mobility multiplier. */
  muFactor: number;
}

/** A device bound to one corner: what the model evaluates. */
export interface EkvParams extends Omit<DeviceParams, 'mu0'> {
  /** Mobility at this corner, m²/(V·s). */
  mu: number;
  /** Temperature, °C. */
  temperature: number;
}

export interface MismatchDef {
  avt_mV_um: number;
  abeta_pct_um: number;
}

export interface KitDef {
  kit: string;
  note: string;
  supply: number;
  lmin: number;
  /** Channel lengths in nanometres (integers keep the axis values exact). */
  lengthsNm: number[];
  /** Sweep steps in millivolts. */
  vgsStepMv: number;
  vdsStepMv: number;
  /** Source-bulk magnitudes in millivolts. */
  vsbMv: number[];
  /** Reference width, m. */
  w: number;
  devices: Record<Polarity, DeviceParams>;
  corners: Record<string, CornerDef>;
  mismatch: Record<Polarity, MismatchDef>;
}

/** Bind device parameters to a corner. */
export function atCorner(dev: DeviceParams, corner: CornerDef): EkvParams {
  const { mu0, ...rest } = dev;
  return { ...rest, vt0: dev.vt0 + corner.dvt, mu: mu0 * corner.muFactor, temperature: corner.temperature };
}
