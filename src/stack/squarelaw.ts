import type { LengthSlice } from '../device/types.js';
import type { DeviceBias, SquareLawCheck, StackShape } from './types.js';
import { vgsWindow } from './invert.js';
import { routOf } from './rout.js';

/** Square-law parameters of one slice: threshold (V) and k' = µCox (A/V²). */
export interface SquareLawFit {
  vth: number;
  kp: number;
}

const POINTS = 120;

/**
 * Threshold and k' by the classic max-slope linear extrapolation of sqrt(ID)
 * against VGS in saturation (common practice). Saturation is ensured by the
 * diode connection VDS = VGS; with sqrt(jd) = sqrt(k'/(2L))·(VGS − Vth),
 * k' = 2·L·slope².
 */
export function fitSquareLaw(slice: LengthSlice, vsb = 0): SquareLawFit {
  const win = vgsWindow(slice, 'diode', vsb);
  if (!win) return { vth: NaN, kp: NaN };
  const [lo, hi] = win;
  const h = (hi - lo) / POINTS;
  const s = Array.from({ length: POINTS + 1 }, (_, j) => {
    const vgs = lo + j * h;
    return Math.sqrt(Math.max(slice.jd(vgs, vgs, vsb), 0));
  });
  let best = 1;
  let slope = -Infinity;
  for (let j = 1; j < POINTS; j++) {
    const d = (s[j + 1] - s[j - 1]) / (2 * h);
    if (d > slope) {
      slope = d;
      best = j;
    }
  }
  if (!(slope > 0)) return { vth: NaN, kp: NaN };
  const vgsBest = lo + best * h;
  return { vth: vgsBest - s[best] / slope, kp: 2 * slice.l * slope * slope };
}

/**
 * What square-law hand analysis predicts for the sized devices: VGS = Vth +
 * Vov with Vov = sqrt(2·I·L/(k'·W)), the headroom rule of thumb, and Rout from
 * λ = gds/ID at each device's bias with ro = 1/(λ·I), gm = 2I/Vov (no body effect).
 */
export function squareLawCheck(
  shape: StackShape,
  slices: readonly LengthSlice[],
  w: readonly number[],
  ops: readonly DeviceBias[],
  current: number,
): SquareLawCheck {
  const fits = slices.map((s, k) => fitSquareLaw(s, ops[k].vsb));
  const vov = fits.map((f, k) => Math.sqrt((2 * current * slices[k].l) / (f.kp * w[k])));
  const vgs = fits.map((f, k) => f.vth + vov[k]);
  const lambda = ops.map((o) => o.gds / o.id);
  const hand = lambda.map((lam, k) => ({ gm: (2 * current) / vov[k], gds: lam * current, gmb: 0 }));
  return {
    vth: fits[0].vth,
    vgs,
    vov,
    headroom: shape.ruleOfThumbHeadroom(vov, vgs),
    rout: routOf(hand),
    lambda,
  };
}
