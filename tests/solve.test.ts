import { describe, expect, it } from 'vitest';
import { ekv, sliceOf } from './helpers/analytic-slice.js';
import { StackwrightError } from '../src/errors.js';
import type { DesignSpec, StackSpec } from '../src/design/types.js';
import { CAUTION, evaluateAtCorner, sizeDesign, sizeStack, type FrontPoint, type KitAccess, type StackResult } from '../src/solve/index.js';
import { solveOperatingPoint, type StackDevice } from '../src/stack/index.js';
import { bindingText } from '../src/report/index.js';

// ---- Analytic kit (invented parameters, not any real process) ----




const LENGTHS = [0.18e-6, 0.25e-6, 0.35e-6, 0.5e-6, 0.7e-6, 1e-6, 1.4e-6, 2e-6];
// A "slow" corner: higher threshold, lower mobility, stronger channel-length modulation (invented).
const CORNERS: Record<string, { dv: number; k: number; lam: number }> = {
  tt: { dv: 0, k: 1, lam: 1 },
  ss: { dv: 0.06, k: 0.85, lam: 1.4 },
};
const AVT = 4e-9; // 4 mV·µm
const ABETA = 1e-8; // 1 %·µm

function analyticKit(withMismatch = true): KitAccess {
  return {
    kit: 'analytic',
    corners: ['tt', 'ss'],
    lengths: () => Float64Array.from(LENGTHS),
    slice: (c, _d, l) => {
      const p = CORNERS[c];
      return sliceOf(l, ekv({ l, vt0: 0.45 + p.dv, kp: 250e-6 * p.k, n: 1.35, lambda: (0.05e-6 / l) * p.lam }));
    },
    mismatch: () => (withMismatch ? { avt: AVT, abeta: ABETA } : undefined),
  };
}

const kit = analyticKit();
const base: StackSpec = {
  name: 'sink', device: 'n', topology: 'cascode', current: 20e-6, rout: 50e6, headroom: 0.5, span: 1.8, objective: 'area',
};
const size = (spec: Partial<StackSpec>, corners = ['tt']) => sizeStack({ ...base, ...spec }, kit, { supply: 1.8, corners });

// Re-solve a reported design from its W, L and gates, independently of the search's bookkeeping.
function rebuilt(r: StackResult, corner = 'tt'): { devices: StackDevice[]; gates: number[] } {
  const devices = r.devices.map((d) => ({ slice: kit.slice(corner, r.device, d.l), w: d.w }));
  const gates = r.devices.map((d) => (r.device === 'n' ? d.gate : 1.8 - d.gate));
  return { devices, gates };
}

describe('sizing search on an analytic kit', () => {
  const area = size({}).results[0];
  const hr = size({ objective: 'headroom' }).results[0];
  const ro = size({ objective: 'rout' }).results[0];

  it('finds a feasible cascode that meets Rout, headroom and current', () => {
    expect(area.feasible).toBe(true);
    expect(area.topology).toBe('cascode');
    expect(area.predicted.rout).toBeGreaterThanOrEqual(base.rout);
    expect(area.predicted.headroom).toBeLessThanOrEqual(base.headroom);
    expect(Math.abs(area.predicted.iout - base.current) / base.current).toBeLessThanOrEqual(0.01);
    expect(area.curve.length).toBeGreaterThanOrEqual(60);
    expect(area.bias).toHaveLength(2);
    expect(area.evaluated).toBeGreaterThan(100);
  });

  it('the reported design really has Rout ≥ target at the headroom target (ΔV/ΔI from two DC solves)', () => {
    const { devices, gates } = rebuilt(area);
    const v = base.headroom;
    const dv = 1e-3;
    const numeric = (2 * dv) / (solveOperatingPoint(devices, gates, v + dv).i - solveOperatingPoint(devices, gates, v - dv).i);
    // Definition of small-signal output resistance, from two independent DC solves.
    expect(numeric).toBeGreaterThan(0.97 * base.rout);
    // Mid-span current from a fresh solve equals the target (the 1 % window of the spec).
    const mid = solveOperatingPoint(devices, gates, 0.5 * (base.headroom + base.span));
    expect(Math.abs(mid.i - base.current) / base.current).toBeLessThan(0.01);
  });

  it('objective orders hold: each objective is best at its own measure among the three designs', () => {
    // Definition of a constrained optimum: no other feasible design beats it on its own objective.
    for (const r of [hr, ro]) expect(r.feasible).toBe(true);
    expect(area.predicted.area).toBeLessThanOrEqual(hr.predicted.area);
    expect(area.predicted.area).toBeLessThanOrEqual(ro.predicted.area);
    expect(hr.predicted.headroom).toBeLessThanOrEqual(area.predicted.headroom + 1e-3);
    expect(hr.predicted.headroom).toBeLessThanOrEqual(ro.predicted.headroom + 1e-3);
    expect(ro.predicted.rout).toBeGreaterThanOrEqual(0.99 * area.predicted.rout);
    expect(ro.predicted.rout).toBeGreaterThanOrEqual(0.99 * hr.predicted.rout);
    // And the trade-off is real: the headroom design buys its headroom.
    expect(hr.predicted.headroom).toBeLessThan(area.predicted.headroom - 0.05);
  });

  it('the square-law comparison extracts a threshold near the model\'s VT0', () => {
    // Common practice: max-slope sqrt(ID) extrapolation lands near VT0 (+ a few UT for a weak-inversion tail).
    expect(area.squareLaw).toBeDefined();
    expect(Math.abs(area.squareLaw!.vth - 0.45)).toBeLessThan(0.1);
    expect(area.squareLaw!.vov.every((x) => x > 0)).toBe(true);
  });

  it('an impossible Rout is reported infeasible with the binding target and the nearest points', () => {
    const r = size({ rout: 1e13 }).results[0];
    expect(r.feasible).toBe(false);
    // The verdict is the Rout the search reached at the headroom target, against the spec's value, in ohms.
    expect(r.binding).toMatchObject({ target: 'rout', required: 1e13, at: base.headroom, device: null, corner: 'tt' });
    expect(r.binding?.achieved).toBe(r.nearest?.routAtHeadroom);
    expect(r.nearest?.routAtHeadroom).toBeGreaterThan(base.rout);
    expect(r.nearest?.routAtHeadroom).toBeLessThan(1e13);
    expect(r.nearest?.headroomAtRout ?? 0).toBeGreaterThan(base.headroom);
    expect(r.devices).toHaveLength(2);
    expect(r.curve.length).toBeGreaterThanOrEqual(60);
  });

  it('a mismatch target is met and σ matches a hand Pelgrom computation', () => {
    const target = 0.005;
    // The unconstrained design misses it, so the constraint is active.
    expect(area.predicted.sigma!).toBeGreaterThan(target);
    const r = size({ mismatch: target }).results[0];
    expect(r.feasible).toBe(true);
    expect(r.predicted.sigma!).toBeLessThanOrEqual(target);
    const d = r.devices[0];
    // Pelgrom, Duinmaijer & Welbers, IEEE JSSC 1989; Kinget, IEEE JSSC 2005: σ² = ((gm/ID)²·AVT² + Aβ²)/(W·L),
    // with gm/ID taken from the analytic EKV model itself at the reported bias (not from the result's gmid).
    const [jd, gmw] = ekv({ l: d.l, vt0: 0.45, kp: 250e-6, n: 1.35, lambda: 0.05e-6 / d.l })(d.vgs, d.vds, d.vsb);
    const gmid = gmw / jd;
    const hand = Math.sqrt((gmid * gmid * AVT * AVT + ABETA * ABETA) / (d.w * d.l));
    expect(r.predicted.sigma! / hand).toBeCloseTo(1, 6);
    expect(r.predicted.area).toBeGreaterThan(area.predicted.area);
  });

  it('a mismatch target on a kit without coefficients is an input error naming mismatch', () => {
    let err: unknown;
    try {
      sizeStack({ ...base, mismatch: 0.01 }, analyticKit(false), { supply: 1.8, corners: ['tt'] });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(StackwrightError);
    expect((err as StackwrightError).kind).toBe('input');
    expect((err as Error).message).toMatch(/mismatch/);
  });

  it('sized for tt alone it fails the slow corner; sized for [tt, ss] it meets both', () => {
    const ss = evaluateAtCorner(area, base, kit, 'ss', 1.8);
    expect(ss.feasible).toBe(false);
    const both = size({}, ['tt', 'ss']).results[0];
    expect(both.feasible).toBe(true);
    expect(both.corners?.map((c) => c.corner)).toEqual(['tt', 'ss']);
    expect(both.corners?.every((c) => c.feasible)).toBe(true);
    // A feasible result names its tightest constraint and no binding one (nothing fails).
    expect(both.binding).toBeUndefined();
    expect(['tt', 'ss']).toContain(both.tightest?.corner);
    expect(both.corners?.every((c) => c.binding === undefined && c.tightest?.corner === c.corner)).toBe(true);
    // The stack's tightest constraint is the one with the least margin among its corners.
    expect(both.corners?.map((c) => c.tightest)).toContainEqual(both.tightest);
    // Re-checking the sized design independently on ss agrees, and its gates moved with the corner.
    const again = evaluateAtCorner(both, base, kit, 'ss', 1.8);
    expect(again.feasible).toBe(true);
    expect(again.gates[0]).toBeGreaterThan(both.devices[0].gate);
    // Rout at the headroom target on ss from fresh DC solves with the re-derived gates (definition of Rout).
    const devices = both.devices.map((d) => ({ slice: kit.slice('ss', 'n', d.l), w: d.w }));
    const dv = 1e-3;
    const numeric = (2 * dv) / (solveOperatingPoint(devices, again.gates, 0.5 + dv).i - solveOperatingPoint(devices, again.gates, 0.5 - dv).i);
    expect(numeric).toBeGreaterThan(0.97 * base.rout);
  });
});

describe('auto topology and the Pareto front', () => {
  const r = size({ topology: 'auto' });

  it('reports one result per topology', () => {
    expect(r.results.map((x) => x.topology)).toEqual(['single', 'cascode', 'cascode-stacked', 'triple']);
    // Common practice: one device cannot give 50 MΩ at 20 µA with these L (ro = 1/(λ·I)).
    expect(r.results[0].feasible).toBe(false);
    expect(r.results[1].feasible).toBe(true);
  });

  // The front holds each topology's own Pareto points (meant to change: the chosen topology must show
  // in the chart even where another topology dominates it), so dominance is checked within a topology.
  it('no front point is dominated by another of its topology (headroom ↓, Rout ↑, area ↓)', () => {
    expect(r.front.length).toBeGreaterThan(3);
    // Pareto dominance, written out independently of the library's helper.
    const dom = (a: FrontPoint, b: FrontPoint) =>
      a.headroom <= b.headroom && a.rout >= b.rout && a.area <= b.area && (a.headroom < b.headroom || a.rout > b.rout || a.area < b.area);
    for (const a of r.front) for (const b of r.front) if (a.topology === b.topology) expect(dom(a, b)).toBe(false);
    expect(new Set(r.front.map((p) => p.topology)).size).toBeGreaterThan(1);
    for (const p of r.front) expect(p.devices.every((d) => d.l > 0 && d.gmid > 0)).toBe(true);
  });
});

describe('sizeDesign', () => {
  it('sizes every stack, p-type in supply-referenced coordinates, with the caution text', () => {
    const design: DesignSpec = {
      file: 'spec.yaml', kit: 'analytic', corners: ['tt'], supply: 1.8,
      stacks: [base, { ...base, name: 'source', device: 'p', topology: 'cascode', rout: 30e6, headroom: 0.6 }],
    };
    const out = sizeDesign(design, kit);
    expect(out.caution).toBe(CAUTION);
    expect(out.stacks.map((s) => s.name)).toEqual(['sink', 'source']);
    expect(Object.keys(out.fronts)).toEqual(['sink', 'source']);
    const p = out.stacks[1];
    expect(p.feasible).toBe(true);
    // Stack coordinates for a p-type source: v = supply − Vout.
    for (const c of p.curve) expect(c.vout).toBeCloseTo(1.8 - c.v, 12);
    expect(p.devices[0].gate).toBeCloseTo(1.8 - p.devices[0].vgs, 9);
  });

  it('rejects a spec for another kit', () => {
    expect(() => sizeDesign({ file: 'spec.yaml', kit: 'other', corners: [], supply: 1.8, stacks: [base] }, kit)).toThrow(/spec.yaml: kit/);
  });
});

// Hand EKV relations for the analytic kit (n = 1.35 is a model parameter; UT = kT/q at 27 °C, SciPy CODATA value).
const UT27 = 0.025864925786328753;
function handVdsat(gmid: number, n = 1.35): number {
  // Enz & Vittoz, Charge-Based MOS Transistor Modeling (2006), constants from memory:
  // gm·n·UT/ID = 2/(1+√(1+4·IC)), VDSsat ≈ 2·UT·√(IC + 1/4) + 3·UT.
  const g = Math.min(gmid * n * UT27, 1);
  const ic = ((2 / g - 1) ** 2 - 1) / 4;
  return 2 * UT27 * Math.sqrt(ic + 0.25) + 3 * UT27;
}

describe('lower devices saturated, minimum width, binding words', () => {
  // Low current, high Rout, little room: the old search parked the bottom of a triple in deep triode here.
  const hard: Partial<StackSpec> = { topology: 'triple', current: 2e-6, rout: 5e9, headroom: 0.45, span: 1.6, objective: 'area' };
  const r = size(hard).results[0];

  // Strong inversion only (gm/ID ≤ 8 /V, VDSsat ≈ 0.24 V): three saturated devices need ≈ 0.55 V.
  const strong: Partial<StackSpec> = { topology: 'triple', gmid: { min: 3, max: 8 } };

  it('every device below the top one has VDS ≥ VDSsat at mid-span, with VDSsat from the EKV relations', () => {
    const ok = size({ ...strong, headroom: 0.6 }).results[0];
    for (const x of [r, ok]) {
      expect(x.feasible).toBe(true);
      for (const d of x.devices) {
        expect(d.vdsat).toBeDefined();
        // Reported VDSsat agrees with the hand EKV value (the table's n is within 0.1 % of the model's).
        expect(Math.abs(d.vdsat! - handVdsat(d.gmid))).toBeLessThan(1e-3);
      }
      for (const d of x.devices.slice(0, -1)) {
        expect(d.vds).toBeGreaterThanOrEqual(handVdsat(d.gmid) - 1e-4);
        // Common practice: a saturated device has intrinsic gain gm/gds well above 1.
        expect(d.gain).toBeGreaterThan(5);
      }
    }
  });

  it('when saturated lower devices cannot fit below the headroom target, the explanation names the headroom a saturated design needs', () => {
    // 2·VDSsat(8 /V) ≈ 0.47 V (hand EKV) leaves too little of 0.5 V for the top device.
    expect(2 * handVdsat(8)).toBeGreaterThan(0.45);
    const run = size({ ...strong, headroom: 0.5 });
    const x = run.results[0];
    expect(x.feasible).toBe(false);
    expect(x.tightest).toBeUndefined();
    expect(x.binding).toMatchObject({ target: 'rout', required: 50e6, at: 0.5, corner: 'tt' });
    // The headroom a saturated design needs lies above the target and leaves room for two saturated lower
    // devices (hand EKV VDSsat); the design shown reaches it, with every lower device saturated.
    const h = x.nearest!.headroomAtRout!;
    expect(h).toBeGreaterThan(0.5);
    expect(h).toBeGreaterThan(2 * handVdsat(8));
    for (const d of x.devices.slice(0, -1)) expect(d.vds).toBeGreaterThanOrEqual(handVdsat(d.gmid) - 1e-4);
    expect(x.corners?.[0].feasible).toBe(false);
  });

  it('no output device and no bias diode is narrower than the shortest table length', () => {
    // Common practice: minimum drawn width and length are of the same order; the kit's shortest L is 0.18 µm.
    for (const x of [r, size({ ...hard, topology: 'cascode' }).results[0]]) {
      for (const d of x.devices) expect(d.w).toBeGreaterThanOrEqual(0.18e-6 * (1 - 1e-9));
      for (const b of x.bias) expect(b.w).toBeGreaterThanOrEqual(0.18e-6 * (1 - 1e-9));
    }
  });

  it('a lengthened bias diode still produces its gate voltage (KCL through the diode on the model)', () => {
    const longer = r.bias.filter((b, k) => b.l > r.devices[k].l);
    expect(longer.length).toBeGreaterThan(0);
    for (const b of longer) {
      const m = kit.slice('tt', 'n', b.l);
      // Diode on the rail: VGS = VDS = its gate voltage; W·jd must equal its current.
      expect((b.w * m.jd(b.voltage, b.voltage, 0)) / b.current).toBeCloseTo(1, 6);
    }
  });

  it('an infeasible Rout reads as words, with no "none" left in them', () => {
    const x = size({ topology: 'single', rout: 1e13 }).results[0];
    expect(x.feasible).toBe(false);
    expect(x.binding).toMatchObject({ target: 'rout', required: 1e13, at: 0.5 });
    // A single device's Rout is its ro = 1/gds (common practice), far below 10 TΩ here.
    const ro = 1 / x.devices[0].gds;
    expect(x.binding!.achieved!).toBeGreaterThan(0.5 * ro);
    expect(x.binding!.achieved!).toBeLessThan(1e13);
    // 10 TΩ is out of reach at any headroom: no finite headroom is reported.
    expect(x.nearest?.headroomAtRout).toBe(Infinity);
    expect(bindingText(x)).toMatch(/^rout \S+ \S?Ω < 10 TΩ at 0\.500 V$/);
    expect(bindingText(x)).not.toMatch(/none|NaN|Infinity|undefined/);
    expect(x.tightest).toBeUndefined();
  });

  it('a feasible result has no binding, only its tightest constraint, at every level', () => {
    expect(r.binding).toBeUndefined();
    expect(['rout', 'headroom', 'iout', 'mismatch', 'saturation']).toContain(r.tightest?.target);
    // Feasible: the tightest target is met, so achieved is on the right side of required.
    const t = r.tightest!;
    const met = { rout: t.achieved! >= t.required!, headroom: t.achieved! <= t.required!, iout: Math.abs(t.achieved! / t.required! - 1) <= 0.01, mismatch: t.achieved! <= t.required!, saturation: t.achieved! >= t.required! };
    expect(met[t.target as keyof typeof met]).toBe(true);
    expect(r.corners?.[0].binding).toBeUndefined();
    expect(r.corners?.[0].tightest).toEqual(r.tightest);
  });
});
