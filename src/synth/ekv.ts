/**
 * Charge-based EKV-style drain current (Enz & Vittoz, "Charge-Based MOS
 * Transistor Modeling", 2006) with short-channel additions. Used only to
 * generate the invented "Larkspur Microsystems" demo kits; not a real process.
 *
 * Pinch-off is linearised at the source: VP − VS = (VGS − VT)/n with
 * VT = VT0 + γ(√(Φ+VSB) − √Φ) − σ(L)·VDS and n = 1 + γ/(2√(Φ+VSB)), so n is
 * constant along a VGS sweep and the textbook gm/ID relations hold exactly.
 */
import { StackwrightError } from '../errors.js';
import { inversionCharge } from './charge.js';
import type { EkvParams } from './params.js';
import { oxideCapacitance, thermalVoltage } from './thermal.js';

/** Bias magnitudes (volts) and geometry (metres). */
export interface Bias {
  l: number;
  w: number;
  vgs: number;
  vds: number;
  vsb: number;
}

/** The model's internal state at one bias, shared by current and capacitances. */
export interface EkvState {
  ut: number;
  n: number;
  vt: number;
  /** Specific current IS = 2·n·μ·Cox·UT²·W/L, A. */
  is: number;
  qs: number;
  /** Drain charge after the velocity-saturation clamp. */
  qd: number;
  id: number;
}

export function slopeFactor(p: EkvParams, vsb: number): number {
  return 1 + p.gamma / (2 * Math.sqrt(p.phi + vsb));
}

export function thresholdVoltage(p: EkvParams, l: number, vds: number, vsb: number): number {
  const body = p.gamma * (Math.sqrt(p.phi + vsb) - Math.sqrt(p.phi));
  const sigma = p.dibl * (p.lmin / l) ** 2;
  return p.vt0 + body - sigma * vds;
}

export function specificCurrent(p: EkvParams, l: number, w: number, vsb: number): number {
  const ut = thermalVoltage(p.temperature);
  return 2 * slopeFactor(p, vsb) * p.mu * oxideCapacitance(p.tox) * ut * ut * (w / l);
}

/**
 * Drain charge where ∂ID/∂qd = 0 under velocity saturation (root of
 * λc·qd² − 2(1+λc·qs)·qd + λc·qs² − 1 = 0), written without cancellation.
 * Below it the drain end is saturated; negative means "never".
 */
export function saturationCharge(qs: number, lambdaC: number): number {
  const b = 1 + lambdaC * qs;
  return (lambdaC * qs * qs - 1) / (b + Math.sqrt(1 + lambdaC * (2 * qs + 1)));
}

/** Throws a one-line StackwrightError for a bias the model cannot take. */
export function checkBias(p: EkvParams, b: Bias): void {
  for (const k of ['l', 'w', 'vgs', 'vds', 'vsb'] as const) {
    if (!Number.isFinite(b[k])) throw new StackwrightError(`${k} must be a finite number, got ${b[k]}`, { where: `synth bias.${k}` });
  }
  if (b.l <= 0 || b.w <= 0) throw new StackwrightError('l and w must be positive', { where: 'synth bias' });
  if (p.phi + b.vsb <= 0) throw new StackwrightError(`vsb ${b.vsb} V is below -phi (${-p.phi} V)`, { where: 'synth bias.vsb' });
}

/** Full model state at one bias; `id` is the drain current magnitude, A. */
export function ekvState(p: EkvParams, b: Bias): EkvState {
  checkBias(p, b);
  const ut = thermalVoltage(p.temperature);
  const n = slopeFactor(p, b.vsb);
  const vt = thresholdVoltage(p, b.l, b.vds, b.vsb);
  const is = specificCurrent(p, b.l, b.w, b.vsb);
  const vs = (b.vgs - vt) / (n * ut);
  const qs = inversionCharge(vs);
  const qdLong = inversionCharge(vs - b.vds / ut);
  // λc = Lsat/L with Lsat = 2μUT/vsat (Enz & Vittoz 2006, velocity saturation).
  const lambdaC = Number.isFinite(p.vsat) ? (2 * p.mu * ut) / (p.vsat * b.l) : 0;
  const qd = lambdaC > 0 ? Math.max(qdLong, saturationCharge(qs, lambdaC)) : qdLong;
  // (qs² + qs) − (qd² + qd), factorised so deep triode keeps its digits.
  const core = (qs - qd) * (qs + qd + 1);
  const velocity = 1 + lambdaC * (qs - qd);
  // Vertical field from the source charge only: 2·n·UT·qs ≈ VGS − VT in strong inversion.
  const mobility = 1 + p.theta * 2 * n * ut * qs;
  const clm = Number.isFinite(p.vaPerLength) ? 1 + b.vds / (p.vaPerLength * b.l) : 1;
  const id = (is * core * clm) / (velocity * mobility);
  return { ut, n, vt, is, qs, qd, id };
}

/** Drain current magnitude, A. */
export function ekvCurrent(p: EkvParams, b: Bias): number {
  return ekvState(p, b).id;
}
