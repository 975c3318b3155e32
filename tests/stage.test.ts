import { describe, expect, it } from 'vitest';
import { ekv, sliceOf, type Model } from './helpers/analytic-slice.js';
import {
  gainOverSwing, handSideRout, handStageGain, handSwing, heldGain, stagePoint, swingOnGrid, traceStage,
  type StageCircuit,
} from '../src/stack/index.js';
import { sizeStage } from '../src/solve/stage-size.js';
import type { KitAccess } from '../src/solve/index.js';
import type { StageSpec } from '../src/design/types.js';
import { parseSpec } from '../src/design/index.js';

const SUPPLY = 1.8;

/**
 * Square-law device per metre of width (Shichman–Hodges with channel-length
 * modulation, common practice): saturation ID = ½·K·Vov²·(1+λ·VDS), triode
 * ID = K·(Vov·VDS − VDS²/2)·(1+λ·VDS), K = k'/L; no body effect.
 */
function squareLaw(p: { kp: number; l: number; vt: number; lambda: number }): Model {
  const k = p.kp / p.l;
  return (vgs, vds) => {
    const vov = vgs - p.vt;
    if (vov <= 0) return [0, 0, 0, 0];
    const clm = 1 + p.lambda * vds;
    if (vds >= vov) {
      const core = 0.5 * k * vov * vov;
      return [core * clm, k * vov * clm, core * p.lambda, 0];
    }
    const core = k * (vov * vds - 0.5 * vds * vds);
    return [core * clm, k * vds * clm, k * (vov - vds) * clm + core * p.lambda, 0];
  };
}

// Invented parameters. K_n = k'·W/L = 200 µA/V² · 10 = 2 mA/V²; K_p = 80 µA/V² · 20 = 1.6 mA/V².
const N = squareLaw({ kp: 200e-6, l: 1e-6, vt: 0.5, lambda: 0.1 });
const P = squareLaw({ kp: 80e-6, l: 1e-6, vt: 0.5, lambda: 0.15 });
const simple: StageCircuit = {
  supply: SUPPLY,
  device: 'n',
  input: { devices: [{ slice: sliceOf(1e-6, N), w: 10e-6 }] },
  // p-type load gate in stack coordinates (measured down from the supply): VSG = 0.7 V, Vov_p = 0.2 V.
  load: { devices: [{ slice: sliceOf(1e-6, P), w: 20e-6 }], gates: [0.7] },
};

describe('gain stage physics: worked example on a square-law device (checked by hand)', () => {
  it('common-source stage with a current-source load at vout = 0.9 V', () => {
    // Hand arithmetic (square law, Razavi, Design of Analog CMOS ICs, ch. 3: Av = −gm1·(ro1 ∥ ro2)):
    //   load: I = ½·1.6 mA/V²·(0.2 V)²·(1 + 0.15·0.9) = 32 µA·1.135 = 36.32 µA
    //   input: Vov² = I / (½·2 mA/V²·(1 + 0.1·0.9)) = 36.32 µA / 1.09 mA/V² = 0.033321 V² → Vov = 0.182541 V
    //          vin = Vt + Vov = 0.682541 V
    //   gm1 = K·Vov·(1 + λ·VDS) = 2 mA/V²·0.182541·1.09 = 397.94 µS
    //   gds1 = λ·½·K·Vov² = 0.1·1 mA/V²·0.033321 = 3.3321 µS;  gds2 = 0.15·32 µA = 4.8 µS
    //   A = 397.94 / (3.3321 + 4.8) = 48.934
    const p = stagePoint(simple, 0.9)!;
    expect(p).not.toBeNull();
    expect(p.i).toBeCloseTo(36.32e-6, 10);
    expect(p.vin).toBeCloseTo(0.682541, 5);
    expect(p.gm).toBeCloseTo(397.94e-6, 8);
    expect(p.gain).toBeCloseTo(48.934, 2);
    // The same by the hand formula A = gm_in·(ro_n ∥ ro_p) with ro = 1/gds.
    expect(handStageGain(p.gm, 1 / 3.3321e-6, 1 / 4.8e-6)).toBeCloseTo(48.934, 2);
  });

  it('swing ends sit at the saturation edges: supply − Vov_n − Vov_p (rule of thumb, common practice)', () => {
    // A target of half the mid-swing gain is met wherever both devices are saturated; in triode gds rises
    // so fast that the gain halves within a few mV of VDS = Vov (square law).
    const t = traceStage(simple, 0.9, 24, { step: 0.02 });
    expect(t.vlow).not.toBeNull();
    // Input edge: the input device carries the load's current there: I = 32 µA·(1 + 0.15·(1.8 − vlow)).
    const vlow = t.vlow!;
    const iLow = 32e-6 * (1 + 0.15 * (SUPPLY - vlow));
    const vovN = Math.sqrt(iLow / (0.5 * 2e-3 * (1 + 0.1 * vlow)));
    expect(Math.abs(vlow - vovN)).toBeLessThan(0.01);
    // Load edge: Vov_p = 0.2 V below the supply.
    expect(Math.abs(t.vhigh! - (SUPPLY - 0.2))).toBeLessThan(0.01);
    expect(Math.abs(t.swing - handSwing(SUPPLY, vovN, 0.2))).toBeLessThan(0.015);
  });
});

describe('gain stage physics: cascoded sides against the nodal and hand formulas', () => {
  const nc: StageCircuit = {
    supply: SUPPLY,
    device: 'n',
    input: { devices: [{ slice: sliceOf(1e-6, N), w: 10e-6 }, { slice: sliceOf(1e-6, N), w: 10e-6 }], cascodeGate: 1.0 },
    load: { devices: [{ slice: sliceOf(1e-6, P), w: 20e-6 }, { slice: sliceOf(1e-6, P), w: 20e-6 }], gates: [0.7, 1.05] },
  };

  it('A = gm_in·(Rout_in ∥ Rout_load) with Rout = ro1 + ro2 + gm2·ro1·ro2 per side (Gray, Hurst, Lewis & Meyer, ch. 4)', () => {
    const p = stagePoint(nc, 0.9)!;
    expect(p).not.toBeNull();
    const side = (d: typeof p.input.devices) => {
      const ro1 = 1 / d[0].gds;
      const ro2 = 1 / d[1].gds;
      return ro1 + ro2 + (d[1].gm + d[1].gmb) * ro1 * ro2;
    };
    const rin = side(p.input.devices);
    const rload = side(p.load.devices);
    expect(p.rin / rin).toBeCloseTo(1, 9);
    expect(p.rload / rload).toBeCloseTo(1, 9);
    expect(p.gain / (p.input.devices[0].gm * (rin * rload) / (rin + rload))).toBeCloseTo(1, 9);
    // Hand form A ≈ gm_in·((gm·ro²)_in ∥ (gm·ro²)_load) (Razavi, ch. 5): within the gm·ro ≫ 1 approximation.
    const hand = (d: typeof p.input.devices) => handSideRout([d[0].gm, d[1].gm], [1 / d[0].gds, 1 / d[1].gds]);
    const approx = handStageGain(p.gm, hand(p.input.devices), hand(p.load.devices));
    expect(Math.abs(approx / p.gain - 1)).toBeLessThan(0.1);
  });

  it('handSideRout: ro for one device, gm2·ro2·ro1 for a cascode, gm3·ro3·gm2·ro2·ro1 for three', () => {
    expect(handSideRout([1e-3], [1e5])).toBe(1e5);
    expect(handSideRout([1e-3, 2e-3], [1e5, 2e5])).toBeCloseTo(2e-3 * 2e5 * 1e5, 0);
    expect(handSideRout([1e-3, 2e-3, 1e-3], [1e5, 2e5, 1e5])).toBeCloseTo(1e-3 * 1e5 * 2e-3 * 2e5 * 1e5, 0);
  });
});

describe('swing and held gain on sampled curves (worked examples)', () => {
  // A tent curve g(v) = 100 − 200·|v − 0.9| on a 50 mV grid: by hand, g ≥ 60 on [0.7, 1.1].
  const vs = Float64Array.from({ length: 37 }, (_, j) => j * 0.05);
  const gains = vs.map((v) => Math.max(0, 100 - 200 * Math.abs(v - 0.9)));
  const j0 = 18;

  it('swing at a gain target is the interval around the design point where the curve is above it', () => {
    const s = swingOnGrid(vs, gains, j0, 60)!;
    expect(s.vlow).toBeCloseTo(0.7, 9);
    expect(s.vhigh).toBeCloseTo(1.1, 9);
    // Between samples the crossing is interpolated: g = 75 at v = 0.775 and 1.025 (100 − 200·0.125).
    const t = swingOnGrid(vs, gains, j0, 75)!;
    expect(t.vlow).toBeCloseTo(0.775, 9);
    expect(t.vhigh).toBeCloseTo(1.025, 9);
    expect(swingOnGrid(vs, gains, j0, 101)).toBeNull();
  });

  it('gain held over a swing is the best interval minimum: 100 − 200·(width/2) for a centred tent', () => {
    expect(gainOverSwing(vs, gains, j0, 0.4)).toBeCloseTo(60, 9);
    expect(gainOverSwing(vs, gains, j0, 0.3)).toBeCloseTo(70, 9);
    // An off-centre design point: the best interval still centres on the peak if it contains the point.
    expect(gainOverSwing(vs, gains, 16, 0.4)).toBeCloseTo(60, 9);
    // If the interval must reach down to the design point at 0.5 V, it is [0.5, 0.9]: min g(0.5) = 20.
    expect(gainOverSwing(vs, gains, 10, 0.4)).toBeCloseTo(20, 9);
  });

  it('held gain solved on the circuit matches the tent result on the square-law stage within the grid', () => {
    const t = traceStage(simple, 0.9, 24, { step: 0.05 });
    const held = heldGain(simple, t, 1.0);
    // The square-law stage is saturated over [0.2, 1.6]: any 1 V window inside holds at least the smallest gain there.
    const inside = t.vs.filter((v) => v > 0.25 && v < 1.55).map((v) => stagePoint(simple, v)!.gain);
    expect(held).toBeGreaterThanOrEqual(Math.min(...inside) * 0.999);
    expect(held).toBeLessThanOrEqual(Math.max(...inside));
  });

  it('held gain never exceeds the gain at the design point (the held-gain climb skips moves by it)', () => {
    const cascoded: StageCircuit = {
      ...simple,
      input: { devices: [simple.input.devices[0], simple.input.devices[0]], cascodeGate: 1.0 },
      load: { devices: [simple.load.devices[0], simple.load.devices[0]], gates: [0.7, 1.05] },
    };
    let checked = 0;
    for (const c of [simple, cascoded]) {
      // Design points across the range, down to the lowest grid point, and widths up to one only a single window fits.
      for (const output of [0.05, 0.3, 0.9, 1.5]) {
        for (const width of [0.2, 0.6, 1.0, 1.4, 1.7]) {
          const t = traceStage(c, output, 24, { step: 0.05 });
          const held = heldGain(c, t, width);
          expect(held).toBeLessThanOrEqual(t.gains[t.j0] * (1 + 1e-6));
          if (held > 0) checked++;
        }
      }
    }
    expect(checked).toBeGreaterThan(10);
  });
});

// An EKV kit (analytic, invented parameters) for the search.
const LENGTHS = [0.18e-6, 0.25e-6, 0.35e-6, 0.5e-6, 0.7e-6, 1e-6, 1.4e-6, 2e-6];
const analyticKit: KitAccess = {
  kit: 'analytic',
  corners: ['tt', 'ss'],
  lengths: () => Float64Array.from(LENGTHS),
  slice: (c, d, l) => {
    const ss = c === 'ss';
    return sliceOf(l, ekv({ l, vt0: (d === 'n' ? 0.45 : 0.5) + (ss ? 0.05 : 0), kp: (d === 'n' ? 250e-6 : 90e-6) * (ss ? 0.85 : 1), n: 1.35, lambda: (0.05e-6 / l) * (ss ? 1.3 : 1) }));
  },
  mismatch: () => undefined,
};
const base: StageSpec = {
  name: 'amp', current: 20e-6, gain: 300, swing: 0.9, output: 0.9,
  input: { device: 'n', topology: 'cascode' }, load: { topology: 'cascode' }, objective: 'area',
};

function rebuild(r: ReturnType<typeof sizeStage>['results'][number], corner = 'tt'): StageCircuit {
  const inDev = r.input.device;
  const ld = r.load.device;
  const st = (d: 'n' | 'p', g: number) => (d === 'n' ? g : SUPPLY - g);
  return {
    supply: SUPPLY,
    device: inDev,
    input: { devices: r.input.devices.map((d) => ({ slice: analyticKit.slice(corner, inDev, d.l), w: d.w })), cascodeGate: r.input.devices[1] ? st(inDev, r.input.devices[1].gate) : undefined },
    load: { devices: r.load.devices.map((d) => ({ slice: analyticKit.slice(corner, ld, d.l), w: d.w })), gates: r.load.devices.map((d) => st(ld, d.gate)) },
  };
}

describe('gain stage search on an analytic kit', () => {
  for (const device of ['n', 'p'] as const) {
    it(`${device}-input cascode stage meets gain and swing; the reported sizes re-solve to the reported figures`, () => {
      const spec = { ...base, input: { ...base.input, device } };
      const { results, front } = sizeStage(spec, analyticKit, { supply: SUPPLY, corners: ['tt'] });
      const r = results[0];
      expect(r.feasible, JSON.stringify(r.binding)).toBe(true);
      expect(r.load.device).toBe(device === 'n' ? 'p' : 'n');
      expect(r.predicted.swing).toBeGreaterThanOrEqual(spec.swing);
      expect(r.predicted.vlow!).toBeLessThanOrEqual(spec.output);
      expect(r.predicted.vhigh!).toBeGreaterThanOrEqual(spec.output);
      // Re-solve independently of the search's bookkeeping: same gain, input voltage and current at the design point.
      const c = rebuild(r);
      const p = stagePoint(c, spec.output)!;
      expect(p.gain / r.predicted.gain).toBeCloseTo(1, 4);
      expect(p.vin).toBeCloseTo(r.input.devices[0].gate, 4);
      expect(p.i / spec.current).toBeCloseTo(1, 3);
      // A = gm_in·(Rout_in ∥ Rout_load) at every curve point: the gain target holds across the reported swing.
      for (const q of r.curve) if (q.vout > r.predicted.vlow! + 1e-3 && q.vout < r.predicted.vhigh! - 1e-3) expect(q.gain).toBeGreaterThanOrEqual(spec.gain);
      expect(r.squareLaw).toBeDefined();
      expect(r.tightest?.target).toMatch(/^(gain|swing)$/);
      expect(front.length).toBeGreaterThan(0);
    });
  }

  it('bias diodes re-derive the fixed gates at another corner; gain and swing are reported there', () => {
    const { results } = sizeStage(base, analyticKit, { supply: SUPPLY, corners: ['tt', 'ss'] });
    const r = results[0];
    const ss = r.corners!.find((c) => c.corner === 'ss')!;
    expect(ss.gates.load.length).toBe(2);
    expect(Math.abs(ss.gates.load[0] - r.load.devices[0].gate)).toBeGreaterThan(1e-3);
    // The ss gates re-solved independently: the load carries its bias current mirrored by the same W/L.
    const c = rebuild(r, 'ss');
    c.load.gates = ss.gates.load.map((g) => SUPPLY - g);
    c.input.cascodeGate = ss.gates.input[0];
    expect(stagePoint(c, base.output)!.gain / ss.predicted.gain).toBeCloseTo(1, 3);
  });

  it('an unreachable pair of targets is infeasible and says which binds and by how much', () => {
    const spec = { ...base, gain: 3e4, swing: 1.3 };
    const r = sizeStage(spec, analyticKit, { supply: SUPPLY, corners: ['tt'] }).results[0];
    expect(r.feasible).toBe(false);
    expect(['gain', 'swing']).toContain(r.binding!.target);
    expect(r.nearest!.gainAtSwing).toBeLessThan(spec.gain);
    expect(r.nearest!.swingAtGain).toBeLessThan(spec.swing);
    const b = r.binding!;
    expect(b.required).toBe(b.target === 'gain' ? spec.gain : spec.swing);
    expect(b.achieved!).toBeLessThan(b.required!);
  });
});

describe('stages in the spec', () => {
  const text = (stage: string) => `kit: k\nsupply: 1.8\nstages:\n  - name: a\n    current: 20u\n    gain: 2000\n    swing: 0.9\n${stage}`;
  it('parses a stage with SI values and defaults', () => {
    const s = parseSpec(text('    input: {device: p, topology: cascode, l: [0.18u, 2u]}\n    gbw: 20meg\n    cap: 1p\n'), 's.yaml');
    expect(s.stacks).toEqual([]);
    const st = s.stages![0];
    expect(st.current).toBeCloseTo(20e-6, 15);
    expect(st).toMatchObject({ gain: 2000, swing: 0.9, output: 0.9, objective: 'area', gbw: 20e6, cap: 1e-12 });
    expect(st.input).toMatchObject({ device: 'p', topology: 'cascode', l: { min: 0.18e-6, max: 2e-6 } });
    expect(st.load.topology).toBe('auto');
  });
  it('names file, line, column and key path of a bad value', () => {
    expect(() => parseSpec(text('    input: {device: q}\n'), 's.yaml')).toThrow(/^s\.yaml:8:21: stages\[0\]\.input\.device: expected n/);
    expect(() => parseSpec(text('    input: {device: n}\n    gbw: 20meg\n'), 's.yaml')).toThrow(/stages\[0\]\.gbw: a gbw target needs the load capacitance/);
    expect(() => parseSpec(text('    input: {device: n}\n    load: {topology: quad}\n'), 's.yaml')).toThrow(/stages\[0\]\.load\.topology: expected one of/);
    expect(() => parseSpec(text('    input: {device: n}\n    output: 2\n'), 's.yaml')).toThrow(/stages\[0\]\.output/);
  });
});
