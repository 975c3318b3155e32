import { describe, expect, it } from 'vitest';
import { fallingRoot } from '../src/numeric/illinois.js';

describe('fallingRoot (Illinois regula falsi on a falling function)', () => {
  it('finds √2 as the root of 2 − x² on [0, 2] (exact value: Math.SQRT2)', () => {
    expect(fallingRoot({ at: (x) => 2 - x * x }, 0, 2, 1e-13)).toBeCloseTo(Math.SQRT2, 12);
  });

  it('finds ln 3 as the root of 3 − eˣ, a curve as steep as a weak-inversion current (exact value: Math.log(3))', () => {
    expect(fallingRoot({ at: (x) => 3 - Math.exp(x) }, -5, 5, 1e-13)).toBeCloseTo(Math.log(3), 12);
  });

  it('known values at the ends replace the samples there: same root, two samples fewer', () => {
    let n = 0;
    const f = { at: (x: number) => (n++, Math.cos(x)) };
    const plain = fallingRoot(f, 0, 3, 1e-12);
    const sampled = n;
    n = 0;
    const known = fallingRoot(f, 0, 3, 1e-12, Math.cos(0), Math.cos(3));
    expect(known).toBe(plain);
    expect(n).toBe(sampled - 2);
    // cos x = 0 at π/2 (exact value: Math.PI / 2).
    expect(plain).toBeCloseTo(Math.PI / 2, 11);
  });

  it('stays inside the bracket when f is not finite at an end (bisection then)', () => {
    const r = fallingRoot({ at: (x) => (x > 1.9 ? NaN : 1 - x) }, 0, 2, 1e-12);
    expect(r).toBeCloseTo(1, 11);
  });
});
