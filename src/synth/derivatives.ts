/**
 * Analytic gm, gds, gmb of the EKV-style model in ekv.ts, by the chain rule
 * through dq/dv = q/(2q+1) (from 2q + ln q = v), as a simulator reports them.
 * For the invented "Larkspur Microsystems" demo kits (not a real process).
 */
import { inversionCharge } from './charge.js';
import { saturationCharge, slopeFactor, specificCurrent, thresholdVoltage, type Bias } from './ekv.js';
import type { EkvParams } from './params.js';
import { thermalVoltage } from './thermal.js';

export interface Small {
  id: number;
  gm: number;
  gds: number;
  /** ∂ID/∂VBS = −∂ID/∂VSB. */
  gmb: number;
  n: number;
  qs: number;
  qd: number;
}

/** d/dqs of saturationCharge(qs, λc). */
function saturationChargeSlope(qs: number, lc: number): number {
  const r = Math.sqrt(1 + lc * (2 * qs + 1));
  const f = lc * qs * qs - 1;
  const g = 1 + lc * qs + r;
  return (2 * lc * qs * g - f * (lc + lc / r)) / (g * g);
}

/** Current and its derivatives at one bias (magnitudes). */
export function smallSignal(p: EkvParams, b: Bias): Small {
  const ut = thermalVoltage(p.temperature);
  const n = slopeFactor(p, b.vsb);
  const dnSb = -p.gamma / (4 * (p.phi + b.vsb) ** 1.5);
  const vt = thresholdVoltage(p, b.l, b.vds, b.vsb);
  const sigma = p.dibl * (p.lmin / b.l) ** 2;
  const is = specificCurrent(p, b.l, b.w, b.vsb);
  const vs = (b.vgs - vt) / (n * ut);
  // dvs/d(vgs, vds, vsb); dVT/dVSB = n − 1. Scalars, not arrays: this runs per table point.
  const vsG = 1 / (n * ut);
  const vsD = sigma / (n * ut);
  const vsS = -(n - 1) / (n * ut) - (vs * dnSb) / n;
  const qs = inversionCharge(vs);
  const qdLong = inversionCharge(vs - b.vds / ut);
  const kS = qs / (2 * qs + 1);
  const qsG = kS * vsG;
  const qsD = kS * vsD;
  const qsS = kS * vsS;
  let qd = qdLong;
  let kD = qdLong / (2 * qdLong + 1);
  let qdG = kD * vsG;
  let qdD = kD * (vsD - 1 / ut);
  let qdS = kD * vsS;
  const lc = Number.isFinite(p.vsat) ? (2 * p.mu * ut) / (p.vsat * b.l) : 0;
  if (lc > 0) {
    const qsat = saturationCharge(qs, lc);
    if (qsat > qdLong) {
      qd = qsat;
      kD = saturationChargeSlope(qs, lc);
      qdG = kD * qsG;
      qdD = kD * qsD;
      qdS = kD * qsS;
    }
  }
  const core = (qs - qd) * (qs + qd + 1);
  const vel = 1 + lc * (qs - qd);
  const mob = 1 + p.theta * 2 * n * ut * qs;
  const va = p.vaPerLength * b.l;
  const clm = Number.isFinite(va) ? 1 + b.vds / va : 1;
  const dclm = Number.isFinite(va) ? 1 / va / clm : 0;
  const id = (is * core * clm) / (vel * mob);
  const scale = (is * clm) / (vel * mob);
  // d id = scale·d core + id·(dIS/IS + dclm/clm − dvel/vel − dmob/mob); IS ∝ n.
  const part = (dqs: number, dqd: number, dn: number, dc: number): number =>
    scale * ((2 * qs + 1) * dqs - (2 * qd + 1) * dqd) +
    id * (dn / n + dc - (lc * (dqs - dqd)) / vel - (p.theta * 2 * ut * (n * dqs + qs * dn)) / mob);
  const gm = part(qsG, qdG, 0, 0);
  const gds = part(qsD, qdD, 0, dclm);
  const gmb = -part(qsS, qdS, dnSb, 0);
  return { id, gm, gds, gmb, n, qs, qd };
}
