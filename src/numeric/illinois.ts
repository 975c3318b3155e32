/** A falling function to find the root of, as an object: hot callers keep one and move it instead of building a closure per search. */
export interface Falling {
  at(x: number): number;
}

/**
 * Root of f in [a, b] with f(a) ≥ 0 > f(b) (one sign change: f falls) by the
 * Illinois variant of regula falsi (superlinear on smooth f, never leaves the
 * bracket; bisection when the interpolation cannot be used; common practice for
 * bracketed roots, as in SciPy's brentq contract). Stops when the bracket or
 * the step is below `tol`. `fa0`/`fb0` are f at the ends when already known
 * (NaN: not known): they are used instead of sampling f there again.
 *
 * @example fallingRoot({ at: (x) => 2 - x * x }, 0, 2, 1e-12) // ≈ 1.41421356
 */
export function fallingRoot(f: Falling, a: number, b: number, tol: number, fa0 = NaN, fb0 = NaN): number {
  let fa = Number.isNaN(fa0) ? f.at(a) : fa0;
  let fb = Number.isNaN(fb0) ? f.at(b) : fb0;
  let side = 0;
  let m = 0.5 * (a + b);
  const a0 = a;
  const b0 = b;
  for (let it = 0; it < 80 && b - a > tol; it++) {
    const t = Number.isFinite(fa) && Number.isFinite(fb) && fa !== fb ? fa / (fa - fb) : 0.5;
    m = a + (b - a) * (t > 0 && t < 1 ? t : 0.5);
    // A sample at an end of the starting bracket is the value known there.
    const fm = m === a0 && !Number.isNaN(fa0) ? fa0 : m === b0 && !Number.isNaN(fb0) ? fb0 : f.at(m);
    if (fm >= 0) {
      if (m - a < 0.5 * tol) return m;
      a = m;
      fa = fm;
      if (side === 1) fb *= 0.5;
      side = 1;
    } else {
      if (b - m < 0.5 * tol) return m;
      b = m;
      fb = fm;
      if (side === -1) fa *= 0.5;
      side = -1;
    }
  }
  return m;
}
