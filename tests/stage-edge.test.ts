import { describe, expect, it } from 'vitest';
import { swingEdge } from '../src/stack/stage-edge.js';
import type { StagePoint } from '../src/stack/stage-point.js';

// A gain curve with a closed-form crossing: A(v) = A0·(1 − ((v − vc)/h)²) meets A = T at
// v = vc ± h·√(1 − T/A0) (solving a quadratic, common practice).
function curve(a0: number, vc: number, h: number) {
  let solves = 0;
  const solve = (v: number): StagePoint | null => {
    solves++;
    const g = a0 * (1 - ((v - vc) / h) ** 2);
    return g > 0 ? ({ gain: g } as StagePoint) : null;
  };
  return { solve, count: () => solves, gain: (v: number) => a0 * (1 - ((v - vc) / h) ** 2) };
}

describe('swing edge on the circuit to 0.5 mV', () => {
  const res = 5e-4;
  const cases = [
    { a0: 3000, vc: 0.9, h: 0.6, target: 1500, inside: 1.3, outside: 1.35 },
    { a0: 3000, vc: 0.9, h: 0.6, target: 1500, inside: 0.5, outside: 0.45 },
    { a0: 800, vc: 0.7, h: 0.4, target: 100, inside: 1.05, outside: 1.1 },
    { a0: 50, vc: 0.5, h: 0.3, target: 49, inside: 0.53, outside: 0.55 },
  ];
  for (const c of cases) {
    it(`ends where the gain still meets ${c.target}, within 0.5 mV of the exact crossing, in no more solves than bisection (${c.inside} → ${c.outside})`, () => {
      const k = curve(c.a0, c.vc, c.h);
      const up = c.outside > c.inside ? 1 : -1;
      const exact = c.vc + up * c.h * Math.sqrt(1 - c.target / c.a0);
      const edge = swingEdge(k.solve, c.inside, c.outside, k.gain(c.inside), Math.max(k.gain(c.outside), 0), c.target, res, null);
      expect(k.gain(edge)).toBeGreaterThanOrEqual(c.target);
      expect(Math.abs(edge - exact)).toBeLessThanOrEqual(res);
      // The reported edge lies on the inside of the crossing.
      expect(up * (exact - edge)).toBeGreaterThanOrEqual(0);
      const halvings = Math.ceil(Math.log2(Math.abs(c.outside - c.inside) / res));
      expect(k.count()).toBeLessThanOrEqual(halvings);
    });
  }

  it('gives bisection its own answer on a smooth curve (the same leaf end, bit for bit)', () => {
    const k = curve(3000, 0.9, 0.6);
    const target = 1500;
    let a = 1.3;
    let b = 1.35;
    while (Math.abs(b - a) > res) {
      const m = 0.5 * (a + b);
      if (k.gain(m) >= target) a = m;
      else b = m;
    }
    expect(swingEdge(k.solve, 1.3, 1.35, k.gain(1.3), k.gain(1.35), target, res, null)).toBe(a);
  });
});
