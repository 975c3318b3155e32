import { describe, expect, it } from 'vitest';
import { edgeOf } from '../src/numeric/index.js';

// A boolean edge found by bisection (common practice): after n halvings of [inside, outside] the holding end lies
// within |outside − inside|/2^n of the true edge, on its holding side. Checked against √2 (Math.SQRT2).
describe('edgeOf', () => {
  it('finds √2 from below within 2^-30, on the side where the test holds', () => {
    const x = edgeOf((v) => v * v <= 2, 1, 2, 30);
    expect(x).toBeLessThanOrEqual(Math.SQRT2);
    expect(Math.SQRT2 - x).toBeLessThan(2 ** -30);
  });

  it('works with the holding end above (a test true down to the edge)', () => {
    const x = edgeOf((v) => v * v >= 2, 2, 1, 30);
    expect(x).toBeGreaterThanOrEqual(Math.SQRT2);
    expect(x - Math.SQRT2).toBeLessThan(2 ** -30);
  });

  it('returns `inside` after zero steps, and never a point where the test fails', () => {
    expect(edgeOf(() => false, 3, 4, 0)).toBe(3);
    expect(edgeOf(() => false, 3, 4, 20)).toBe(3);
  });
});
