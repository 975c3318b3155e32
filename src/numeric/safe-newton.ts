import type { Falling } from './illinois.js';

/** A falling function that also gives its slope: `at(x)` returns f(x) and leaves f′(x) in `slope`. */
export interface FallingSloped extends Falling {
  slope: number;
}

/**
 * Root of f in [a, b] with f(a) ≥ 0 > f(b) (f falls), from a start `x0` inside, by Newton's method kept inside the
 * bracket: each sample narrows the bracket, and a step that would leave it (or a slope that is not negative) is
 * replaced by bisection. This is the safeguarded Newton of Numerical Recipes' rtsafe (Press et al., 3rd ed. §9.4),
 * common practice for a bracketed root with a derivative. Stops when a step or the bracket is below `tol`. NaN when
 * f is NaN somewhere on the way (outside a table): the caller falls back to a search without slopes.
 * With `certify`, the ends of [a, b] need not have been checked: the result is a root only when reached by a Newton
 * step from `x0` (a step below `tol` proves a root within it), and NaN otherwise (no start inside, a bisection
 * needed), so that a caller checks the ends only when the quick path fails.
 *
 * @example fallingNewton({ slope: 0, at(x) { this.slope = -2 * x; return 2 - x * x; } }, 0, 2, 1e-12, 1) // ≈ 1.41421356
 */
export function fallingNewton(f: FallingSloped, a: number, b: number, tol: number, x0: number, certify = false): number {
  const inside = x0 > a && x0 < b;
  if (certify && !inside) return NaN;
  let x = inside ? x0 : 0.5 * (a + b);
  for (let it = 0; it < 100; it++) {
    const fx = f.at(x);
    if (!(fx >= 0) && !(fx < 0)) return NaN;
    if (fx === 0) return x;
    const d = f.slope;
    if (fx > 0) a = x;
    else b = x;
    if (d < 0) {
      const step = fx / d;
      // A step below tol ends it, also one too small to move x at all (which the bracket test below would refuse).
      if (Math.abs(step) < tol) return x - step;
      const next = x - step;
      if (next > a && next < b) {
        x = next;
        continue;
      }
    }
    if (certify) return NaN;
    x = 0.5 * (a + b);
    if (b - a < tol) return x;
  }
  return certify ? NaN : x;
}
