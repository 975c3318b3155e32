import { describe, expect, it } from 'vitest';
import { StackwrightError } from '../src/errors.js';
import { designCurves, probe, sliceAt, vgsFor } from '../src/device/index.js';
import type { DeviceTable, StoredQuantity } from '../src/table/index.js';
import ref from './fixtures/scipy/slice-scheme.json' with { type: 'json' };

type Q = Partial<Record<StoredQuantity, number>> & { id: number };

/** Builds an invented table (not process data) from an analytic device function. */
function build(
  axes: { l: number[]; vgs: number[]; vds: number[]; vsb: number[] },
  f: (l: number, vgs: number, vds: number, vsb: number) => Q,
  referenceWidth = 1e-6,
): DeviceTable {
  const n = axes.l.length * axes.vgs.length * axes.vds.length * axes.vsb.length;
  const data: Partial<Record<StoredQuantity, Float64Array>> = {};
  let k = 0;
  for (const l of axes.l) for (const g of axes.vgs) for (const d of axes.vds) for (const s of axes.vsb) {
    const v = f(l, g, d, s);
    for (const [q, x] of Object.entries(v)) (data[q as StoredQuantity] ??= new Float64Array(n))[k] = x as number;
    k++;
  }
  return {
    meta: {
      format: 'stackwright-table', version: 1, kit: 'invented', device: 'n', corner: 'tt', referenceWidth,
      sources: [], derived: {}, units: {}, note: 'invented test data',
    },
    axes: { l: Float64Array.from(axes.l), vgs: Float64Array.from(axes.vgs), vds: Float64Array.from(axes.vds), vsb: Float64Array.from(axes.vsb) },
    data: data as DeviceTable['data'],
  };
}

const range = (a: number, b: number, step: number): number[] =>
  Array.from({ length: Math.round((b - a) / step) + 1 }, (_, i) => Number((a + i * step).toFixed(10)));

// Square law with body effect (common practice; e.g. Sedra & Smith, Microelectronic Circuits):
// id = (k/2)(W/L)(vgs−vt)²(1+λ·vds), vt = vt0 + γ(√(2φF+vsb) − √(2φF)). Parameters are invented.
const K = 200e-6;
const W = 1e-6;
const LAMBDA = 0.1;
const VT0 = 0.455;
const GAMMA = 0.4;
const PHI2 = 0.7;
const vt = (vsb: number): number => VT0 + GAMMA * (Math.sqrt(PHI2 + vsb) - Math.sqrt(PHI2));
function squareLaw(l: number, vgs: number, vds: number, vsb: number, withGmb = true): Q {
  const vov = vgs - vt(vsb);
  if (vov <= 0) return withGmb ? { id: 0, gm: 0, gds: 0, gmb: 0 } : { id: 0, gm: 0, gds: 0 };
  const b = K * (W / l);
  const id = 0.5 * b * vov * vov * (1 + LAMBDA * vds);
  const gm = b * vov * (1 + LAMBDA * vds);
  const gds = 0.5 * b * vov * vov * LAMBDA;
  const q: Q = { id, gm, gds, cgg: 2e-15 * (l / 1e-6) };
  if (withGmb) q.gmb = (gm * GAMMA) / (2 * Math.sqrt(PHI2 + vsb));
  return q;
}
const SQ_AXES = { l: [0.5e-6, 1e-6, 2e-6], vgs: range(0, 1.5, 0.01), vds: range(0.1, 1.5, 0.2), vsb: range(0, 0.5, 0.05) };
const sq = build(SQ_AXES, (l, g, d, s) => squareLaw(l, g, d, s));

describe('slice interpolation', () => {
  const t = build(ref.axes, () => ({ id: 0 }), ref.referenceWidth);
  for (const [q, arr] of Object.entries(ref.data)) t.data[q as StoredQuantity] = Float64Array.from(arr);

  it('matches the independent numpy implementation of the scheme to 1e-10', () => {
    // Source: tests/fixtures/scipy/slice-scheme.json from scripts/scipy-reference.py (numpy np.interp compositions).
    expect(ref.queries.length).toBeGreaterThan(60);
    ref.queries.forEach(([l, vgs, vds, vsb], i) => {
      const s = sliceAt(t, l);
      for (const q of Object.keys(ref.expected) as Array<keyof typeof ref.expected>) {
        const want = ref.expected[q][i];
        const got = s.value(q, vgs, vds, vsb);
        expect(Math.abs(got - want), `${q} at query ${i}`).toBeLessThanOrEqual(1e-10 * Math.abs(want) + 1e-25);
      }
      // small() is the same per metre of width.
      const sm = s.small(vgs, vds, vsb);
      expect(Math.abs(sm[0] * ref.referenceWidth - ref.expected.id[i])).toBeLessThanOrEqual(1e-10 * ref.expected.id[i]);
      expect(Math.abs(sm[3] * ref.referenceWidth - ref.expected.gmb[i])).toBeLessThanOrEqual(1e-10 * ref.expected.gmb[i]);
    });
  });

  it('reproduces the weak-inversion exponential exactly, so gm/ID = 1/(n·UT) between nodes', () => {
    // Weak inversion: id ∝ exp(vgs/(n·UT)), gm/ID = 1/(n·UT) (Tsividis, Operation and Modeling of the MOS Transistor).
    // Geometric interpolation along VGS is exact for an exponential; log–log across L is exact for id ∝ 1/L.
    const n = 1.4;
    const ut = 0.025852;
    const wi = build({ l: [1e-7, 1e-6], vgs: [0, 0.1, 0.25, 0.3], vds: [0.5, 1], vsb: [0, 0.5] }, (l, g) => {
      const id = 1e-12 * (1e-6 / l) * Math.exp(g / (n * ut));
      return { id, gm: id / (n * ut), gds: 1e-3 * id, gmb: 0.3 * id / (n * ut) };
    });
    const s = sliceAt(wi, 3.3e-7);
    for (const vgs of [0.01, 0.137, 0.2999]) {
      const want = 1e-12 * (1e-6 / 3.3e-7) * Math.exp(vgs / (n * ut));
      expect(s.value('id', vgs, 0.7, 0.2) / want).toBeCloseTo(1, 12);
      const op = s.op(vgs, 0.7, 0.2, 2e-6);
      expect(op.gmid * n * ut).toBeCloseTo(1, 12);
      expect(op.id / (2 * want)).toBeCloseTo(1, 12); // width scales current (common practice)
    }
  });

  it('gives jd and its exact slopes from one lookup (jdSlopes), the analytic ones where the scheme is exact', () => {
    // Weak inversion id ∝ exp(vgs/(n·UT)) (Tsividis, Operation and Modeling of the MOS Transistor): ∂id/∂vgs = id/(n·UT).
    // Linear in vds and vsb, which the bilinear part reproduces exactly, so ∂/∂vds and ∂/∂vsb are the analytic ones.
    const n = 1.4;
    const ut = 0.025852;
    const lam = 0.08;
    const kb = 0.2;
    const f = (g: number, d: number, s: number) => 1e-12 * Math.exp(g / (n * ut)) * (1 + lam * d) * (1 - kb * s);
    const wi = build({ l: [1e-6, 2e-6], vgs: [0, 0.1, 0.25, 0.3], vds: [0.5, 0.8, 1], vsb: [0, 0.5] }, (_l, g, d, s) => {
      const id = f(g, d, s);
      return { id, gm: id / (n * ut), gds: id * lam / (1 + lam * d), gmb: id * kb / (1 - kb * s) };
    });
    const s = sliceAt(wi, 1e-6);
    const out = new Float64Array(4);
    for (const [g, d, b] of [[0.05, 0.6, 0.1], [0.137, 0.93, 0.37], [0.2999, 0.5, 0]]) {
      s.jdSlopes(Float64Array.of(g, d, b), out);
      expect(out[0]).toBe(s.jd(g, d, b)); // the same current Newton's residuals use
      const two = new Float64Array(2);
      s.jdGm(g, d, b, two);
      expect(two[1] / two[0]).toBeCloseTo(1 / (n * ut), 10); // gm/ID = 1/(n·UT) in weak inversion (Tsividis)
      expect([...two]).toEqual([...s.small(g, d, b)].slice(0, 2)); // jdGm gives small()'s own first two values
      // A DC solve keeps jdSlopes' current and reads only the conductances: together they are small()'s values.
      const three = new Float64Array(3);
      s.conductances(Float64Array.of(g, d, b), three);
      s.jdSlopes(Float64Array.of(g, d, b), out);
      expect([out[0], ...three]).toEqual([...s.small(g, d, b)]);
      expect(three[0] / two[0]).toBeCloseTo(1 / (n * ut), 10); // gm/ID = 1/(n·UT) in weak inversion (Tsividis)
      const id = f(g, d, b) / 1e-6;
      expect(out[1] / (id / (n * ut))).toBeCloseTo(1, 10);
      expect(out[2] / ((id * lam) / (1 + lam * d))).toBeCloseTo(1, 10);
      expect(out[3] / ((-id * kb) / (1 - kb * b))).toBeCloseTo(1, 10);
    }
    // Elsewhere: the central difference of jd inside one cell, O(h²) (common practice).
    const q = sliceAt(sq, 1.3e-6);
    const h = 1e-6;
    for (const [g, d, b] of [[0.713, 0.62, 0.13], [1.204, 1.17, 0.41]]) {
      q.jdSlopes(Float64Array.of(g, d, b), out);
      expect(out[1] / ((q.jd(g + h, d, b) - q.jd(g - h, d, b)) / (2 * h))).toBeCloseTo(1, 5);
      expect(out[2] / ((q.jd(g, d + h, b) - q.jd(g, d - h, b)) / (2 * h))).toBeCloseTo(1, 5);
      expect(out[3] / ((q.jd(g, d, b + h) - q.jd(g, d, b - h)) / (2 * h))).toBeCloseTo(1, 5);
    }
  });

  it('is bounded by the neighbouring nodes along VGS and by the neighbouring lengths', () => {
    // Geometric and linear means of two numbers lie between them (common practice).
    const s = sliceAt(sq, 1e-6);
    const lo = s.value('id', 0.7, 0.5, 0.1);
    const hi = s.value('id', 0.71, 0.5, 0.1);
    for (const vgs of [0.7001, 0.703, 0.7077, 0.7099]) {
      const v = s.value('id', vgs, 0.5, 0.1);
      expect(v).toBeGreaterThanOrEqual(lo);
      expect(v).toBeLessThanOrEqual(hi);
    }
    const a = sliceAt(sq, 0.5e-6).value('gm', 0.853, 0.77, 0.123);
    const b = sliceAt(sq, 1e-6).value('gm', 0.853, 0.77, 0.123);
    for (const l of [0.51e-6, 0.6e-6, 0.77e-6, 0.99e-6]) {
      const v = sliceAt(sq, l).value('gm', 0.853, 0.77, 0.123);
      expect(v).toBeLessThanOrEqual(a);
      expect(v).toBeGreaterThanOrEqual(b);
    }
  });

  it('reproduces table nodes exactly', () => {
    // Interpolants pass through their data points (definition).
    const s = sliceAt(sq, 2e-6);
    const k = ((2 * 151 + 80) * 8 + 3) * 11 + 4;
    expect(s.value('id', 0.8, 0.7, 0.2)).toBe(sq.data.id[k]);
    expect(s.value('cgg', 0.8, 0.7, 0.2)).toBe(sq.data.cgg![k]);
  });

  it('throws range errors naming the axis, its range and the table, including for L', () => {
    const s = sliceAt(sq, 1e-6);
    const cases: Array<[() => unknown, RegExp]> = [
      [() => s.jd(1.6, 0.5, 0), /^vgs = 1\.6 V is outside the table range \[0 V, 1\.5 V\] \(invented\/n\/tt at l = 1 µm\)/],
      [() => s.small(1, 0.05, 0), /^vds = 50 mV is outside the table range \[100 mV, 1\.5 V\]/],
      [() => s.op(1, 0.5, -0.1, 1e-6), /^vsb = -100 mV is outside the table range \[0 V, 500 mV\]/],
      [() => sliceAt(sq, 3e-6), /^l = 3 µm is outside the table range \[500 nm, 2 µm\] \(invented\/n\/tt\)/],
      [() => s.jd(NaN, 0.5, 0), /^vgs = NaN/],
    ];
    for (const [fn, re] of cases) {
      try {
        fn();
        expect.unreachable(String(re));
      } catch (e) {
        expect(e).toBeInstanceOf(StackwrightError);
        expect((e as StackwrightError).kind).toBe('range');
        expect((e as Error).message).toMatch(re);
      }
    }
  });

  it('estimates a missing gmb from the vsb slope of id instead of using 0', () => {
    // Body effect: gmb = gm·γ/(2√(2φF+vsb)) (common practice; Sedra & Smith). Central differences are O(h²).
    const noGmb = build(SQ_AXES, (l, g, d, s) => squareLaw(l, g, d, s, false));
    expect(noGmb.data.gmb).toBeUndefined();
    const s = sliceAt(noGmb, 1e-6);
    expect(s.estimated.gmb).toMatch(/vsb/);
    for (const [vgs, vsb] of [[1.0, 0.1], [1.2, 0.25], [0.9, 0.4]]) {
      const op = s.op(vgs, 0.9, vsb, W);
      const exact = squareLaw(1e-6, vgs, 0.9, vsb).gmb as number;
      expect(Math.abs(op.gmb / exact - 1)).toBeLessThan(5e-3);
    }
    // With a single vsb point no slope exists: NaN, never a silent 0.
    const flat = build({ ...SQ_AXES, vsb: [0] }, (l, g, d, s) => squareLaw(l, g, d, s, false));
    expect(sliceAt(flat, 1e-6).op(1, 0.9, 0, W).gmb).toBeNaN();
  });

  it('fills the operating point: gain = gm/gds, ft = gm/(2π·cgg), NaN ft without capacitances', () => {
    // fT = gm/(2π·Cgg) (common practice).
    const op = sliceAt(sq, 1e-6).op(1.05, 0.9, 0, 3e-6);
    expect(op.gain).toBeCloseTo(op.gm / op.gds, 12);
    expect(op.ft).toBeCloseTo(op.gm / (2 * Math.PI * op.cgg), 0);
    expect(op.cgg / 3).toBeCloseTo(2e-15, 25); // capacitance scales with width from the 1 µm reference
    expect(op.jd * 3e-6).toBeCloseTo(op.id, 20);
    expect(op.cgs).toBeNaN();
    const noCap = build({ l: [1e-6, 2e-6], vgs: [0.5, 1], vds: [0.5, 1], vsb: [0, 0.2] }, () => ({ id: 1e-5, gm: 1e-4, gds: 1e-6, gmb: 1e-5 }));
    expect(sliceAt(noCap, 1.5e-6).op(0.7, 0.7, 0.1, 1e-6).ft).toBeNaN();
  });

  it('small() writes into the given array and caches slices per table and L', () => {
    const s = sliceAt(sq, 1e-6);
    expect(sliceAt(sq, 1e-6)).toBe(s);
    const out = new Float64Array(4);
    expect(s.small(1, 0.9, 0, out)).toBe(out);
    expect(out[0]).toBe(s.jd(1, 0.9, 0));
    expect(s.range).toEqual({ vgs: [0, 1.5], vds: [0.1, 1.5], vsb: [0, 0.5] });
  });
});

describe('probe', () => {
  it('at a given vgs, gm = 2·id/Vov and gm/ID = 2/Vov (square law), also between lengths', () => {
    // Square law: gm = 2·ID/Vov (common practice). Interpolation error along VGS here is ~1e-3 at Vov ≥ 0.2 V.
    for (const l of [1e-6, 0.7e-6]) {
      for (const [vgs, vsb] of [[0.7123, 0], [1.0456, 0.2], [1.3333, 0.37]]) {
        const op = probe(sq, { l, vgs, vsb, vds: 0.9 });
        const vov = vgs - vt(vsb);
        expect(Math.abs(op.gm / (2 * op.id / vov) - 1)).toBeLessThan(2e-3);
        const exact = squareLaw(l, vgs, 0.9, vsb); // id ∝ 1/L, which log–log across L keeps exactly
        expect(Math.abs(op.id / exact.id - 1)).toBeLessThan(2e-3);
        expect(op.by).toBe('vgs');
        expect(op.w).toBe(1e-6);
      }
    }
  });

  it('defaults vds to the middle of the vds axis and vsb to 0', () => {
    const op = probe(sq, { l: 1e-6, vgs: 1 });
    expect(op.vds).toBe(0.8); // (0.1 + 1.5) / 2
    expect(op.vsb).toBe(0);
  });

  it('inverts gm/ID: probing at gmid X returns gmid X, at VGS = vt + 2/X (square law)', () => {
    // Square law: gm/ID = 2/Vov (common practice).
    for (const l of [1e-6, 1.4e-6]) {
      for (const x of [3, 8, 15, 40]) {
        const op = probe(sq, { l, gmid: x, vsb: 0.1, vds: 1.1 });
        expect(op.by).toBe('gmid');
        expect(op.gmid / x).toBeCloseTo(1, 9);
        expect(Math.abs(op.vgs - (vt(0.1) + 2 / x))).toBeLessThan(2e-3);
      }
    }
  });

  it('inverts jd the same way', () => {
    // Square law: jd = (k/2)(1/L)Vov²(1+λ·vds), so VGS = vt + sqrt(2·jd·L/(k(1+λ·vds))) (common practice).
    for (const jd of [1, 10, 50]) {
      const op = probe(sq, { l: 1e-6, jd, vds: 0.9 });
      expect(op.jd / jd).toBeCloseTo(1, 9);
      const vgs = vt(0) + Math.sqrt((2 * jd * 1e-6) / (K * (1 + LAMBDA * 0.9)));
      expect(Math.abs(op.vgs - vgs)).toBeLessThan(2e-3);
    }
    expect(() => probe(sq, { l: 1e-6, jd: 1e6, vds: 0.9 })).toThrow(/jd = 1 MA\/m is above what the table reaches; reachable jd/);
  });

  it('a gm/ID above the ceiling is a one-line range error giving the reachable range', () => {
    // Square law at the first node above vt: gm/ID = 2/(0.46 − 0.455) = 400 1/V; at 1.5 V: 2/1.045 = 1.914 1/V.
    try {
      probe(sq, { l: 1e-6, gmid: 1000, vds: 0.9 });
      expect.unreachable();
    } catch (e) {
      expect((e as StackwrightError).kind).toBe('range');
      const msg = (e as Error).message;
      expect(msg).toMatch(/^gmid = 1000 1\/V is above what the table reaches; reachable gmid invented\/n\/tt at l = 1 µm, vds = 900 mV, vsb = 0 V is 1\.914 1\/V to 400 1\/V$/);
    }
    expect(() => probe(sq, { l: 1e-6, gmid: 1, vds: 0.9 })).toThrow(/below what the table reaches/);
  });

  it('on a plateau picks the lowest-current solution after the peak', () => {
    // Rule documented in probe.ts, checked against a brute-force scan of the slice.
    // gm/ID nodes rise (leakage), peak, wobble on a plateau, then fall: invented shape.
    const vgsAxis = range(0, 1, 0.1);
    const gmidNodes = [10, 25, 30, 28, 29.5, 28.5, 20, 12, 8, 6, 5];
    const wob = build({ l: [1e-6, 2e-6], vgs: vgsAxis, vds: [0.5, 1], vsb: [0, 0.5] }, (_l, g) => {
      const i = Math.round(g * 10);
      const id = 1e-9 * Math.exp(3 * g);
      return { id, gm: gmidNodes[i] * id, gds: 1e-2 * id, gmb: 0.2 * gmidNodes[i] * id };
    });
    const s = sliceAt(wob, 1e-6);
    const scan = (x: number): number => {
      // lowest VGS above the peak (0.2 V) where gm/ID comes down to x
      for (let v = 0.2; v <= 1; v += 1e-5) {
        const o = s.small(v, 0.7, 0.2);
        if (o[1] / o[0] <= x) return v;
      }
      return NaN;
    };
    for (const x of [29, 28.2, 25, 10]) {
      const v = vgsFor(s, { gmid: x }, 0.7, 0.2);
      expect(Math.abs(v - scan(x))).toBeLessThan(1.1e-5);
      const o = s.small(v, 0.7, 0.2);
      expect(o[1] / o[0]).toBeCloseTo(x, 9);
    }
    expect(vgsFor(s, { gmid: 29 }, 0.7, 0.2)).toBeLessThan(0.3); // not the later crossings near 0.35 and 0.45
    expect(vgsFor(s, { gmid: 30 }, 0.7, 0.2)).toBeCloseTo(0.2, 12);
  });

  it('approaches the EKV weak-inversion ceiling 1/(n·UT)', () => {
    // EKV: id = 2nβUT²·ln²(1+e^((vgs−vt)/(2nUT))) (Enz, Krummenacher & Vittoz 1995); gm/ID → 1/(n·UT) in weak inversion.
    const n = 1.3;
    const ut = 0.025852; // kT/q at 300 K (from memory)
    const ekv = build({ l: [1e-6, 2e-6], vgs: range(0, 1.2, 0.02), vds: [0.5, 1], vsb: [0, 0.3] }, (l, g) => {
      const u = (g - 0.45) / (2 * n * ut);
      const F = Math.log1p(Math.exp(u));
      const beta = 1e-4 * (1e-6 / l);
      const id = 2 * n * beta * ut * ut * F * F;
      const gm = (id * (Math.exp(u) / (1 + Math.exp(u)))) / (n * ut * F);
      return { id, gm, gds: 0.02 * id, gmb: 0.25 * gm };
    });
    try {
      probe(ekv, { l: 1e-6, gmid: 100 });
      expect.unreachable();
    } catch (e) {
      const m = /to ([\d.]+) 1\/V$/.exec((e as Error).message);
      expect(m).not.toBeNull();
      expect(Math.abs(Number(m![1]) * n * ut - 1)).toBeLessThan(2e-3);
    }
  });

  it('wants exactly one of vgs, gmid, jd and a positive width', () => {
    expect(() => probe(sq, { l: 1e-6 })).toThrow(/exactly one of vgs, gmid, jd \(got none\)/);
    expect(() => probe(sq, { l: 1e-6, vgs: 1, gmid: 10 })).toThrow(/got vgs, gmid/);
    expect(() => probe(sq, { l: 1e-6, vgs: 1, w: 0 })).toThrow(/positive width/);
    expect(() => probe(sq, { l: 1e-6, gmid: -5 })).toThrow(/positive number/);
  });
});

describe('design curves', () => {
  it('gives one curve per length over the VGS axis, dropping points below the current floor', () => {
    // Square law: below vt the current is 0, so those points drop; gain = gm/gds = 2(1+λvds)/(λ·Vov) (common practice).
    const curves = designCurves(sq, { vds: 0.9, vsb: 0 });
    expect(curves.map((c) => c.l)).toEqual([0.5e-6, 1e-6, 2e-6]);
    const c = curves[1];
    expect(c.points[0].vgs).toBeCloseTo(0.46, 12); // first node above vt = 0.455 V
    expect(c.points.length).toBe(151 - 46);
    const p = c.points.find((q) => Math.abs(q.vgs - 1) < 1e-9)!;
    const vov = 1 - VT0;
    expect(p.gmid).toBeCloseTo(2 / vov, 10);
    expect(p.gain).toBeCloseTo((2 * (1 + LAMBDA * 0.9)) / (LAMBDA * vov), 8);
    expect(p.jd).toBeCloseTo(0.5 * K * (1 / 1e-6) * vov * vov * (1 + LAMBDA * 0.9), 8);
    expect(p.ft).toBeCloseTo((K * vov * (1 + LAMBDA * 0.9)) / (2 * Math.PI * 2e-15), -3);
    const between = designCurves(sq, { vds: 0.9, vsb: 0, lengths: [0.8e-6] });
    expect(between[0].points.length).toBe(105);
  });
});
