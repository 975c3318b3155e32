import type { LengthSlice } from '../device/types.js';

// Exact SI values since the 2019 redefinition (CODATA 2018).
const BOLTZMANN = 1.380649e-23;
const CHARGE = 1.602176634e-19;
const ZERO_CELSIUS = 273.15;

/** Thermal voltage kT/q at a temperature in °C (27 °C when unknown), V. */
export function thermalVoltage(celsius = 27): number {
  return (BOLTZMANN * (celsius + ZERO_CELSIUS)) / CHARGE;
}

const SCAN = 64;
// Per slice, per thermal voltage, per VSB in 0.1 mV steps: numeric keys, no strings built per call.
const memo = new WeakMap<LengthSlice, Map<number, Map<number, number>>>();

/** Highest gm/ID over VGS at one VSB (weak-inversion ceiling), sampled at mid-range VDS; 0 when none. */
export function gmidCeiling(slice: LengthSlice, vsb: number): number {
  const r = slice.range;
  const vds = 0.5 * (r.vds[0] + r.vds[1]);
  const out = new Float64Array(4);
  let best = 0;
  for (let j = 0; j <= SCAN; j++) {
    const vgs = r.vgs[0] + ((r.vgs[1] - r.vgs[0]) * j) / SCAN;
    // Only jd and gm are needed (the same values small() gives).
    const s = slice.jdGm ? (slice.jdGm(vgs, vds, vsb, out), out) : slice.small(vgs, vds, vsb, out);
    if (s[0] > 0 && s[1] > 0) best = Math.max(best, s[1] / s[0]);
  }
  return best;
}

/**
 * Slope factor n = 1/(UT·max gm/ID), the EKV weak-inversion limit gm/ID = 1/(n·UT),
 * at one L and VSB (memoised per slice at 0.1 mV). n < 1 is unphysical (square-law
 * tables have no weak-inversion ceiling), so n is floored at 1.
 */
export function slopeFactor(slice: LengthSlice, vsb: number, ut: number): number {
  let bySlice = memo.get(slice);
  if (!bySlice) memo.set(slice, (bySlice = new Map()));
  let byUt = bySlice.get(ut);
  if (!byUt) bySlice.set(ut, (byUt = new Map()));
  const v = Math.min(Math.max(Math.round(vsb * 1e4) / 1e4, slice.range.vsb[0]), slice.range.vsb[1]);
  const key = Math.round(v * 1e4);
  let n = byUt.get(key);
  if (n === undefined) {
    const ceiling = gmidCeiling(slice, v);
    n = ceiling > 0 ? Math.max(1 / (ut * ceiling), 1) : 1;
    byUt.set(key, n);
  }
  return n;
}

/**
 * Inversion coefficient from gm/ID by the EKV relation gm·n·UT/ID = 2/(1+√(1+4·IC))
 * (Enz & Vittoz, Charge-Based MOS Transistor Modeling, 2006): IC = ((2/g − 1)² − 1)/4.
 */
export function inversionCoefficient(gmid: number, n: number, ut: number): number {
  const g = gmid * n * ut;
  if (!(g > 0)) return Infinity;
  if (g >= 1) return 0;
  const r = 2 / g - 1;
  return (r * r - 1) / 4;
}

/** EKV saturation voltage VDSsat ≈ 2·UT·√(IC + 1/4) + 3·UT (Enz & Vittoz 2006; constants from memory). */
export function ekvVdsat(ic: number, ut: number): number {
  return 2 * ut * Math.sqrt(ic + 0.25) + 3 * ut;
}

/** Table-derived VDSsat of a device at its gm/ID, L (the slice) and VSB. */
export function saturationVoltage(slice: LengthSlice, gmid: number, vsb: number, ut: number): number {
  return ekvVdsat(inversionCoefficient(gmid, slopeFactor(slice, vsb, ut), ut), ut);
}
