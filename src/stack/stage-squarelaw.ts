import { parallel } from './stage-point.js';

/**
 * Hand-analysis Rout of one side from square-law gm and ro = 1/(λ·I) per
 * device, rail outwards: ro for one device, and each cascode multiplies by its
 * intrinsic gain, R_k ≈ gm_k·ro_k·R_{k−1} — so a cascode gives gm·ro² (Gray,
 * Hurst, Lewis & Meyer, Analysis and Design of Analog ICs, ch. 4; Razavi,
 * Design of Analog CMOS ICs, ch. 5). Body effect and the ro terms that the
 * gm·ro ≫ 1 approximation drops are left out on purpose: this is the hand check.
 */
export function handSideRout(gm: readonly number[], ro: readonly number[]): number {
  let r = ro[0];
  for (let k = 1; k < ro.length; k++) r *= gm[k] * ro[k];
  return r;
}

/** Hand-analysis gain gm_in·(R_in ∥ R_load): A = gm·(ro_n ∥ ro_p) for a simple stage (same sources). */
export function handStageGain(gmIn: number, rIn: number, rLoad: number): number {
  return gmIn * parallel(rIn, rLoad);
}

/** Rule-of-thumb output swing: the supply less each side's saturation headroom, supply − Σ VDSsat (common practice). */
export function handSwing(supply: number, headroomIn: number, headroomLoad: number): number {
  return supply - headroomIn - headroomLoad;
}
