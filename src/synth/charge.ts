/**
 * Normalised inversion charge of the charge-based EKV model (Enz & Vittoz 2006):
 * q solves 2q + ln q = v, with v = (VP − V)/UT. Part of the generator for the
 * invented "Larkspur Microsystems" demo kits.
 */

/**
 * Solve 2q + ln q = v for q > 0. Newton on x = ln q: f(x) = 2eˣ + x − v is
 * convex and increasing, so Newton converges from any start after one step.
 */
export function inversionCharge(v: number): number {
  let x = v <= 2 ? v - 2 * Math.exp(Math.min(v, 0)) : Math.log(v / 2);
  for (let k = 0; k < 80; k++) {
    const e = 2 * Math.exp(x);
    const dx = (e + x - v) / (e + 1);
    x -= dx;
    if (Math.abs(dx) <= 1e-15 * Math.max(1, Math.abs(x))) break;
  }
  return Math.exp(x);
}

/** Normalised current i = q² + q of one channel end. */
export function normalisedCurrent(q: number): number {
  return q * q + q;
}
