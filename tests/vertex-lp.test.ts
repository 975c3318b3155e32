import { describe, expect, it } from 'vitest';
import { boxLp1, vertexLp } from '../src/numeric/index.js';
import ref from './fixtures/scipy/vertex-lp.json' with { type: 'json' };

// The ridge step's linear programme (src/numeric/vertex-lp.ts) against scipy.optimize.linprog (HiGHS):
// random programmes min c·x subject to A x ≤ b with a box, written by scripts/lp-reference.py; the last 40 are shaped
// like a ridge step's (x = 0 feasible, so vertexLp takes its simplex path; objective entries of zero, so optimal faces).
describe('vertexLp agrees with scipy.optimize.linprog', () => {
  it('the same optimum value (and point), or no answer where linprog finds the programme infeasible', () => {
    let solved = 0;
    for (const c of ref.cases) {
      const d = c.c.length;
      const rows = c.A.map((a, i) => ({ a: Float64Array.from(a), b: c.b[i] }));
      const got = vertexLp(c.c, rows, d);
      if (c.status !== 0) {
        // linprog status 2: infeasible.
        expect(got).toBeNull();
        continue;
      }
      solved++;
      expect(got).not.toBeNull();
      expect(got!.value).toBeCloseTo(c.value!, 7);
      // Every row holds at the answer.
      for (const r of rows) expect(r.a.reduce((s, v, k) => s + v * got!.x[k], 0)).toBeLessThanOrEqual(r.b + 1e-7);
    }
    expect(solved).toBeGreaterThan(80);
  });

  it('a worked example: min −x − y with x + y ≤ 1, 0 ≤ x, y ≤ 0.8 has value −1 (textbook LP, common practice)', () => {
    const row = (a: number[], b: number) => ({ a: Float64Array.from(a), b });
    const got = vertexLp([-1, -1], [row([1, 1], 1), row([1, 0], 0.8), row([0, 1], 0.8), row([-1, 0], 0), row([0, -1], 0)], 2);
    expect(got!.value).toBeCloseTo(-1, 12);
  });

  it('boxLp1 (one row and a box) has vertexLp\'s optimum value on random programmes of up to eight unknowns', () => {
    // A small deterministic generator (no seed-dependent library): x_{n+1} = a·x_n mod m.
    let state = 12345;
    const rand = () => (state = (state * 16807) % 2147483647) / 2147483647;
    let feasible = 0;
    for (let t = 0; t < 200; t++) {
      const d = 1 + Math.floor(rand() * 8);
      const c = Array.from({ length: d }, () => (rand() < 0.1 ? 0 : rand() * 2 - 1));
      const a = Float64Array.from({ length: d }, () => (rand() < 0.1 ? 0 : rand() * 2 - 1));
      const b = rand() * 2 - 1.5;
      const up = Array.from({ length: d }, () => rand());
      const down = Array.from({ length: d }, () => rand());
      const rows = [{ a, b }];
      for (let k = 0; k < d; k++) {
        rows.push({ a: Float64Array.from({ length: d }, (_, j) => (j === k ? 1 : 0)), b: up[k] });
        rows.push({ a: Float64Array.from({ length: d }, (_, j) => (j === k ? -1 : 0)), b: down[k] });
      }
      const want = vertexLp(c, rows, d);
      const got = boxLp1(c, a, b, up, down);
      if (!want) {
        expect(got).toBeNull();
        continue;
      }
      feasible++;
      expect(got!.value).toBeCloseTo(want.value, 9);
      for (const r of rows) expect(r.a.reduce((s, v, k) => s + v * got!.x[k], 0)).toBeLessThanOrEqual(r.b + 1e-9);
    }
    expect(feasible).toBeGreaterThan(100);
  });
});
