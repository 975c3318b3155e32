import { describe, expect, it } from 'vitest';
import { fallingNewton, type FallingSloped } from '../src/numeric/safe-newton.js';

/** f and f′ as a FallingSloped, counting samples. */
function sloped(f: (x: number) => number, df: (x: number) => number): FallingSloped & { n: number } {
  return { slope: 0, n: 0, at(x: number) { this.n++; this.slope = df(x); return f(x); } };
}

describe('fallingNewton (safeguarded Newton on a falling function, Press et al. §9.4 rtsafe)', () => {
  it('finds √2 as the root of 2 − x² on [0, 2] (exact value: Math.SQRT2), from a start and from none', () => {
    expect(fallingNewton(sloped((x) => 2 - x * x, (x) => -2 * x), 0, 2, 1e-13, 1)).toBeCloseTo(Math.SQRT2, 12);
    expect(fallingNewton(sloped((x) => 2 - x * x, (x) => -2 * x), 0, 2, 1e-13, NaN)).toBeCloseTo(Math.SQRT2, 12);
  });

  it('finds ln 3 as the root of 3 − eˣ from far below, where plain Newton leaves [−5, 5] (exact value: Math.log(3))', () => {
    // From x0 = −4 the Newton step is (3 − e⁻⁴)/e⁻⁴ ≈ 160: outside, so bisection takes over until Newton fits.
    const f = sloped((x) => 3 - Math.exp(x), (x) => -Math.exp(x));
    expect(fallingNewton(f, -5, 5, 1e-13, -4)).toBeCloseTo(Math.log(3), 12);
    // Certified mode gives up there instead (the caller then checks the ends and searches the bracket).
    expect(fallingNewton(sloped((x) => 3 - Math.exp(x), (x) => -Math.exp(x)), -5, 5, 1e-13, -4, true)).toBeNaN();
  });

  it('a log-linear function (a geometric interpolant along VGS) is solved in two samples from any start', () => {
    // log(i/J) with J = J0·e^{x/s}: linear in x, root x = s·ln(i/J0) (closed form).
    const s = 0.04;
    const f = sloped((x) => Math.log(1e-6 / (1e-9 * Math.exp(x / s))), () => -1 / s);
    const r = fallingNewton(f, 0, 1, 1e-10, 0.9, true);
    expect(r).toBeCloseTo(s * Math.log(1000), 12);
    expect(f.n).toBe(2);
  });

  it('certified mode: NaN without a start inside, or when no root lies in [a, b] (f > 0 everywhere there)', () => {
    expect(fallingNewton(sloped((x) => 2 - x * x, (x) => -2 * x), 0, 2, 1e-13, 3, true)).toBeNaN();
    expect(fallingNewton(sloped((x) => 5 - x, () => -1), 0, 2, 1e-13, 1, true)).toBeNaN();
  });

  it('NaN when f is NaN on the way (outside a table)', () => {
    expect(fallingNewton(sloped((x) => (x > 0.5 ? NaN : 1 - x), () => -1), 0, 2, 1e-12, 0.6)).toBeNaN();
  });
});
