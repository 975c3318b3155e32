/**
 * Gate and drain capacitances for the invented "Larkspur Microsystems" demo
 * kits: charge-based intrinsic partition (Enz & Vittoz 2006; in strong
 * inversion it reduces to Meyer's 2/3·W·L·Cox in saturation) plus overlap and
 * a reverse-biased drain junction. A reasonable approximation, not a full
 * charge model: velocity saturation is ignored here.
 */
import type { Bias } from './ekv.js';
import type { EkvParams } from './params.js';
import { oxideCapacitance } from './thermal.js';

export interface Capacitances {
  cgg: number;
  cgs: number;
  cgd: number;
  cdd: number;
}

/** Normalised intrinsic Cgs (swap qs and qd for Cgd). */
export function intrinsicGateSource(qs: number, qd: number): number {
  const s = qs + qd + 1;
  return ((qs / 3) * (2 * qs + 4 * qd + 3)) / (s * s);
}

/** `st` carries the slope factor and the source/drain charges of the model. */
export function capacitances(p: EkvParams, b: Bias, st: { n: number; qs: number; qd: number }): Capacitances {
  const qd = Math.max(st.qd, 0);
  const cox = oxideCapacitance(p.tox) * b.w * b.l;
  const cgsN = intrinsicGateSource(st.qs, qd);
  const cgdN = intrinsicGateSource(qd, st.qs);
  // Gate-bulk through the depletion layer: (n−1)/n of what the channel leaves.
  const cgbN = ((st.n - 1) / st.n) * Math.max(0, 1 - cgsN - cgdN);
  const ov = p.cov * b.w;
  const cgs = cox * cgsN + ov;
  const cgd = cox * cgdN + ov;
  const cgg = cgs + cgd + cox * cgbN;
  // Drain-bulk: channel part (n−1)·Cgd,i plus the junction at VDB = VDS + VSB.
  const junction = (p.cj * b.w) / Math.pow(1 + Math.max(0, b.vds + b.vsb) / p.pb, p.mj);
  const cdd = cgd + (st.n - 1) * cox * cgdN + junction;
  return { cgg, cgs, cgd, cdd };
}
