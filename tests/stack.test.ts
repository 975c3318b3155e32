import { describe, expect, it } from 'vitest';
import type { LengthSlice } from '../src/device/types.js';
import { ekv, sliceOf, type Model } from './helpers/analytic-slice.js';
import { StackwrightError } from '../src/errors.js';
import { topologyOf } from '../src/topology/index.js';
import {
  biasDevices,
  biasGates,
  ekvVdsat,
  inversionCoefficient,
  saturationVoltage,
  slopeFactor,
  thermalVoltage,
  findHeadroom,
  fitSquareLaw,
  holds,
  routAt,
  sampleAt,
  sizeStackDevices,
  solveOperatingPoint,
  stackCurve,
  type StackDevice,
} from '../src/stack/index.js';
import { bracketedOperatingPoint } from '../src/stack/bracketed.js';

// ---- Analytic test devices (invented parameters, not any real process) ----


/**
 * Shichman–Hodges square law with channel-length modulation and body effect
 * (Razavi, Design of Analog CMOS Integrated Circuits, ch. 2):
 * ID/W = (k'/2L)·Vov²·(1+λVDS) in saturation, k'/L·(Vov·VDS − VDS²/2)·(1+λVDS) in triode,
 * Vth = Vth0 + γ(√(2φF+VSB) − √(2φF)).
 */
function squareLaw(p: { l: number; vth0: number; kp: number; lambda: number; gamma: number; phi2: number }): Model {
  const beta = p.kp / p.l;
  return (vgs, vds, vsb) => {
    const vth = p.vth0 + p.gamma * (Math.sqrt(p.phi2 + vsb) - Math.sqrt(p.phi2));
    const dvth = p.gamma / (2 * Math.sqrt(p.phi2 + vsb));
    const vov = vgs - vth;
    if (vov <= 0) return [0, 0, 0, 0];
    const clm = 1 + p.lambda * vds;
    if (vds >= vov) {
      const gm = beta * vov * clm;
      return [0.5 * beta * vov * vov * clm, gm, 0.5 * beta * vov * vov * p.lambda, gm * dvth];
    }
    const core = vov * vds - 0.5 * vds * vds;
    const gm = beta * vds * clm;
    return [beta * core * clm, gm, beta * (vov - vds) * clm + beta * core * p.lambda, gm * dvth];
  };
}


const ekvSlice = (l: number) => sliceOf(l, ekv({ l, vt0: 0.45, kp: 250e-6, n: 1.35, lambda: 0.08e-6 / l }));
const slSlice = (l: number, lambda = 0.05) =>
  sliceOf(l, squareLaw({ l, vth0: 0.4, kp: 200e-6, lambda, gamma: 0.4, phi2: 0.7 }));

function cascodeOn(slices: LengthSlice[], gmid: number[], setpoints: number[], topology: 'cascode' | 'triple' | 'cascode-stacked' = 'cascode') {
  const sized = sizeStackDevices({ shape: topologyOf(topology), slices, gmid, setpoints, current: 20e-6, vmid: 1.2 });
  if (!sized) throw new Error('test design not reachable');
  const devices: StackDevice[] = slices.map((slice, k) => ({ slice, w: sized.w[k] }));
  return { sized, devices };
}

describe('Rout of the solved stack', () => {
  const { sized, devices } = cascodeOn([ekvSlice(0.5e-6), ekvSlice(0.3e-6)], [12, 10], [0.2]);

  for (const v of [0.6, 0.9, 1.5]) {
    it(`two devices at v = ${v} V: Rout = ro1 + ro2 + (gm2+gmb2)·ro1·ro2`, () => {
      const op = solveOperatingPoint(devices, sized.gates, v);
      const [d1, d2] = op.devices;
      const ro1 = 1 / d1.gds;
      const ro2 = 1 / d2.gds;
      // Gray, Hurst, Lewis & Meyer, Analysis and Design of Analog Integrated Circuits, ch. 4;
      // Razavi, Design of Analog CMOS Integrated Circuits, ch. 5 (cascode output resistance).
      const textbook = ro1 + ro2 + (d2.gm + d2.gmb) * ro1 * ro2;
      expect(routAt(op) / textbook).toBeCloseTo(1, 10);
      expect(d2.vsb).toBeGreaterThan(0.1); // the upper device really has body effect
    });

    it(`two devices at v = ${v} V: Rout agrees with ΔV/ΔI from two DC solves`, () => {
      // Independent check: definition of small-signal resistance, finite difference of the DC solution.
      const dv = 2e-3;
      const hi = solveOperatingPoint(devices, sized.gates, v + dv);
      const lo = solveOperatingPoint(devices, sized.gates, v - dv);
      const numeric = (2 * dv) / (hi.i - lo.i);
      const op = solveOperatingPoint(devices, sized.gates, v);
      expect(numeric / routAt(op)).toBeGreaterThan(0.98);
      expect(numeric / routAt(op)).toBeLessThan(1.02);
    });
  }

  it('three devices: Rout agrees with ΔV/ΔI from two DC solves', () => {
    const t = cascodeOn([ekvSlice(0.5e-6), ekvSlice(0.3e-6), ekvSlice(0.3e-6)], [12, 12, 10], [0.2, 0.2], 'triple');
    const v = 1.0;
    const dv = 2e-3;
    const numeric = (2 * dv) / (solveOperatingPoint(t.devices, t.sized.gates, v + dv).i - solveOperatingPoint(t.devices, t.sized.gates, v - dv).i);
    // Definition of small-signal resistance (finite difference of the DC solution).
    expect(numeric / routAt(solveOperatingPoint(t.devices, t.sized.gates, v))).toBeCloseTo(1, 1);
  });
});

describe('DC operating point', () => {
  const { sized, devices } = cascodeOn([ekvSlice(0.5e-6), ekvSlice(0.3e-6)], [12, 10], [0.2]);

  it('KCL: the solved current equals each device\'s own table current at its solved bias', () => {
    for (const v of [0.05, 0.3, 0.7, 1.2, 1.8]) {
      const op = solveOperatingPoint(devices, sized.gates, v);
      expect(op.nodes[2]).toBe(v);
      for (let k = 0; k < 2; k++) {
        const xs = op.nodes[k];
        const id = devices[k].w * devices[k].slice.jd(sized.gates[k] - xs, op.nodes[k + 1] - xs, xs);
        // Kirchhoff's current law: one current through a series chain.
        expect(Math.abs(id - op.i) / op.i).toBeLessThan(1e-9);
      }
    }
  });

  it('at the design bias the current is the design current and the lower drain sits at its setpoint', () => {
    const op = solveOperatingPoint(devices, sized.gates, 1.2);
    // By the low-voltage biasing definition: g2 = VDS1 + VGS2 pins x1 = VDS1 at v = vmid.
    expect(op.i / 20e-6).toBeCloseTo(1, 8);
    expect(op.nodes[1]).toBeCloseTo(0.2, 6);
  });

  it('Newton and the bracketed bisection agree', () => {
    for (const v of [0.1, 0.4, 1.0]) {
      const a = solveOperatingPoint(devices, sized.gates, v);
      const b = bracketedOperatingPoint(devices, sized.gates, v);
      expect(a.i / b.i).toBeCloseTo(1, 8);
      expect(a.nodes[1]).toBeCloseTo(b.nodes[1], 6);
    }
  });

  it('the I–V curve is monotone (a passive chain of monotone devices) and starts at zero current', () => {
    const curve = stackCurve(devices, sized.gates, 1.8, { intervals: 90 });
    expect(curve).toHaveLength(91);
    expect(Math.abs(curve[0].i)).toBeLessThan(1e-18);
    for (let j = 1; j < curve.length; j++) expect(curve[j].i).toBeGreaterThanOrEqual(curve[j - 1].i);
  });

  it('a bias beyond the table (VSB) is a range error, and a NaN curve point, not a crash', () => {
    const slices = [sliceOf(0.5e-6, ekv({ l: 0.5e-6, vt0: 0.45, kp: 250e-6, n: 1.35, lambda: 0.16 }), 0.3), sliceOf(0.5e-6, ekv({ l: 0.5e-6, vt0: 0.45, kp: 250e-6, n: 1.35, lambda: 0.16 }), 0.3)];
    const devs = slices.map((slice) => ({ slice, w: 5e-6 }));
    let err: unknown;
    try {
      solveOperatingPoint(devs, [0.7, 1.6], 1.5);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(StackwrightError);
    expect((err as StackwrightError).kind).toBe('range');
    expect((err as Error).message).toMatch(/vsb/);
    expect(Number.isNaN(sampleAt(devs, [0.7, 1.6], 1.5).i)).toBe(true);
  });
});

describe('headroom on square-law devices (rule of thumb, common practice)', () => {
  // Square law: gm/ID = 2/Vov in saturation, so gm/ID = 8 /V puts Vov = 0.25 V at the design current.
  const l = 1e-6;
  const vth = 0.4;
  const vov = 0.25;
  const gmid = 2 / vov;

  function headroomOf(topology: 'cascode' | 'cascode-stacked', setpoints: number[]): number {
    const slices = [slSlice(l), slSlice(l)];
    const sized = sizeStackDevices({ shape: topologyOf(topology), slices, gmid: [gmid, gmid], setpoints, current: 20e-6, vmid: 1.35 });
    if (!sized) throw new Error('unreachable');
    const devices = slices.map((slice, k) => ({ slice, w: sized.w[k] }));
    const mid = solveOperatingPoint(devices, sized.gates, 1.35);
    const curve = stackCurve(devices, sized.gates, 1.8, { anchor: mid });
    // Rout criterion at half the saturated value: on this model that moves the edge by ~λ·Vov²/2 ≈ 2 mV.
    return findHeadroom(devices, sized.gates, curve, { rout: 0.5 * routAt(mid), iMid: mid.i });
  }

  it('stacked-diode cascode needs VGS + Vov = Vth + 2·Vov ≈ 0.9 V, half of a 1.8 V rail', () => {
    const h = headroomOf('cascode-stacked', []);
    // Common practice: self-biased cascode mirror headroom Vth + 2Vov (Razavi ch. 5; Gray et al. ch. 4).
    expect(Math.abs(h - (vth + 2 * vov))).toBeLessThan(0.015); // stated tolerance for the Rout criterion
    expect(h / 1.8).toBeCloseTo(0.5, 1);
  });

  it('low-voltage cascode with VDS1 just above Vov needs ≈ 2·Vov = 0.5 V', () => {
    // VDS1 20 mV above the edge keeps the bottom device saturated, so Rout is flat above the knee.
    const margin = 0.02;
    const h = headroomOf('cascode', [vov + margin]);
    // Common practice: wide-swing cascode headroom VDS1 + Vov2 ≈ 2Vov (Razavi ch. 5).
    expect(Math.abs(h - (2 * vov + margin))).toBeLessThan(0.015);
    expect(h).toBeLessThan(headroomOf('cascode-stacked', []) - vth + 0.05);
  });

  it('the headroom search gives the answer of a plain 1 mV bisection, where the targets hold and fail 1 mV lower', () => {
    // Reference: bisection between the last failing and first holding curve points, a DC solve at every
    // midpoint (the definition of the headroom in the README; bisection is common practice).
    for (const topology of ['cascode', 'cascode-stacked'] as const) {
      const slices = [slSlice(l), slSlice(l)];
      const sized = sizeStackDevices({ shape: topologyOf(topology), slices, gmid: [gmid, gmid], setpoints: topology === 'cascode' ? [vov + 0.02] : [], current: 20e-6, vmid: 1.35 });
      if (!sized) throw new Error('unreachable');
      const devices = slices.map((slice, k) => ({ slice, w: sized.w[k] }));
      const mid = solveOperatingPoint(devices, sized.gates, 1.35);
      const curve = stackCurve(devices, sized.gates, 1.8, { intervals: 16, anchor: mid });
      for (const share of [0.2, 0.5, 0.8, 0.95, 0.99]) {
        const target = { rout: share * routAt(mid), iMid: mid.i };
        const h = findHeadroom(devices, sized.gates, curve, target);
        let j = curve.length - 1;
        while (j > 0 && holds(curve[j - 1], target)) j--;
        let lo = curve[j - 1].v;
        let hi = curve[j].v;
        while (hi - lo > 1e-3) {
          const m = 0.5 * (lo + hi);
          if (holds(sampleAt(devices, sized.gates, m, mid), target)) hi = m;
          else lo = m;
        }
        expect(h).toBe(hi);
        expect(holds(sampleAt(devices, sized.gates, h, mid), target)).toBe(true);
        expect(holds(sampleAt(devices, sized.gates, h - 1e-3, mid), target)).toBe(false);
      }
    }
  });

  it('max-slope sqrt(ID) extrapolation recovers Vth and k\' of a pure square-law device', () => {
    const s = slSlice(l, 0);
    const f0 = fitSquareLaw(s, 0);
    // Common practice: sqrt(ID) is linear in VGS for a square-law device; intercept Vth, slope sqrt(k'/2L).
    expect(f0.vth).toBeCloseTo(0.4, 3);
    expect(f0.kp / 200e-6).toBeCloseTo(1, 3);
    const f1 = fitSquareLaw(s, 0.5);
    // Body effect, Vth = Vth0 + γ(√(2φF+VSB) − √(2φF)) (Razavi ch. 2).
    expect(f1.vth).toBeCloseTo(0.4 + 0.4 * (Math.sqrt(1.2) - Math.sqrt(0.7)), 3);
  });
});

describe('bias diodes', () => {
  it('each diode reproduces its gate voltage at the bias current, stacked diodes included', () => {
    const slices = [ekvSlice(0.5e-6), ekvSlice(0.3e-6)];
    const { sized } = cascodeOn(slices, [12, 10], [], 'cascode-stacked');
    const bias = biasDevices(topologyOf('cascode-stacked'), slices, sized.gates, 10e-6);
    expect(bias[1].stackedOn).toBe(0);
    // A diode-connected device settles where its own I–V carries the forced current (KCL).
    const top = bias[1].w * slices[1].jd(sized.gates[1] - sized.gates[0], sized.gates[1] - sized.gates[0], sized.gates[0]);
    expect(top / 10e-6).toBeCloseTo(1, 9);
    const again = biasGates(bias, slices);
    expect(again[0]).toBeCloseTo(sized.gates[0], 7);
    expect(again[1]).toBeCloseTo(sized.gates[1], 7);
  });
});

describe('saturation voltage from the table (EKV interpolation)', () => {
  const ut = thermalVoltage(27);

  it('kT/q at 27 °C and 125 °C matches SciPy\'s CODATA constants', () => {
    // scipy.constants.k·T/scipy.constants.e (CODATA 2018), computed once with SciPy 1.x.
    expect(ut).toBeCloseTo(0.025864925786328753, 15);
    expect(thermalVoltage(125)).toBeCloseTo(0.03430991238323103, 15);
  });

  it('the inversion coefficient inverts gm·n·UT/ID = 2/(1+√(1+4·IC)) over five decades', () => {
    // Enz & Vittoz, Charge-Based MOS Transistor Modeling (2006): the forward relation, evaluated here by hand.
    const n = 1.3;
    for (const ic of [0.01, 0.1, 1, 10, 100, 1000]) {
      const gmid = 2 / (1 + Math.sqrt(1 + 4 * ic)) / (n * ut);
      expect(inversionCoefficient(gmid, n, ut) / ic).toBeCloseTo(1, 9);
    }
  });

  it('VDSsat tends to 4·UT in weak inversion and to (VP − VS) + 3·UT in strong inversion', () => {
    // Enz & Vittoz 2006 (constants from memory): 2·UT·√(IC+1/4) + 3·UT; weak-inversion limit 4·UT is common practice.
    expect(ekvVdsat(0, ut) / (4 * ut)).toBeCloseTo(1, 12);
    // Strong inversion: IC = ((VP − VS)/(2·UT))², so 2·UT·√IC = VP − VS.
    const pinch = 0.4;
    const ic = (pinch / (2 * ut)) ** 2;
    expect(Math.abs(ekvVdsat(ic, ut) - (pinch + 3 * ut))).toBeLessThan(0.1 * ut);
  });

  it('the slope factor comes back from the weak-inversion ceiling of an EKV device (n = 1.35)', () => {
    // EKV weak-inversion limit gm/ID = 1/(n·UT) (Enz, Krummenacher & Vittoz 1995); the model uses UT = 25.85 mV.
    const expected = (1.35 * 0.02585) / ut;
    for (const vsb of [0, 0.3]) expect(slopeFactor(ekvSlice(0.5e-6), vsb, ut) / expected).toBeCloseTo(1, 2);
    // A square-law device has no ceiling (gm/ID = 2/Vov grows without bound): n is floored at 1.
    expect(slopeFactor(slSlice(0.5e-6), 0, ut)).toBe(1);
  });

  it('at VDS = VDSsat an EKV device carries ≥ 98 % of its saturated current; at half of it clearly less', () => {
    // Common practice: "saturated" means the current is within a few percent of its flat value.
    // λ = 0 so the flat value is the large-VDS current; ID is the EKV closed form (Enz, Krummenacher & Vittoz 1995).
    const flat = sliceOf(0.5e-6, ekv({ l: 0.5e-6, vt0: 0.45, kp: 250e-6, n: 1.35, lambda: 0 }));
    for (const vgs of [0.3, 0.45, 0.6, 0.9]) {
      const [jd, gm] = flat.small(vgs, 1.5, 0);
      const vdsat = saturationVoltage(flat, gm / jd, 0, ut);
      expect(flat.jd(vgs, vdsat, 0) / jd).toBeGreaterThanOrEqual(0.98);
      expect(flat.jd(vgs, vdsat / 2, 0) / jd).toBeLessThan(0.95);
    }
  });
});

describe('minimum width', () => {
  const LS = [0.18e-6, 0.25e-6, 0.35e-6, 0.5e-6, 0.7e-6, 1e-6];
  const slices = new Map(LS.map((l) => [l, ekvSlice(l)]));
  const widen = { wmin: 0.18e-6, lengths: LS, slice: (l: number) => slices.get(l)! };

  it('a device narrower than wmin makes sizeStackDevices refuse the design', () => {
    const d = { shape: topologyOf('cascode'), slices: [ekvSlice(0.18e-6), ekvSlice(0.18e-6)], gmid: [8, 8], setpoints: [0.3], current: 1e-6, vmid: 1.2 };
    const free = sizeStackDevices(d)!;
    expect(Math.min(...free.w)).toBeLessThan(0.18e-6);
    expect(sizeStackDevices({ ...d, wmin: 0.18e-6 })).toBeNull();
  });

  it('a too-narrow bias diode takes the next length that reaches wmin and still carries its current at the same VGS', () => {
    // Gate 0.7 V at 2 µA on L = 0.18 µm would need W ≈ 50 nm (strong inversion, jd ~ 1/L).
    const gates = [0.45, 0.7];
    const ib = 2e-6;
    const plain = biasDevices(topologyOf('cascode'), [slices.get(0.18e-6)!, slices.get(0.18e-6)!], gates, ib);
    expect(plain[1].w).toBeLessThan(widen.wmin);
    const b = biasDevices(topologyOf('cascode'), [slices.get(0.18e-6)!, slices.get(0.18e-6)!], gates, ib, widen)!;
    expect(b[1].l).toBeGreaterThan(0.18e-6);
    expect(b[1].w).toBeGreaterThanOrEqual(widen.wmin);
    // KCL through the diode (gate = drain) with the EKV closed form at its new length.
    expect((b[1].w * ekvSlice(b[1].l).jd(0.7, 0.7, 0)) / ib).toBeCloseTo(1, 9);
    // It is the first such length: the one before it is still too narrow.
    const before = LS[LS.indexOf(b[1].l) - 1];
    expect(ib / ekvSlice(before).jd(0.7, 0.7, 0)).toBeLessThan(widen.wmin);
    // The bottom diode was wide enough and keeps its length.
    expect(b[0].l).toBe(0.18e-6);
    // With no length long enough the candidate is rejected.
    expect(biasDevices(topologyOf('cascode'), [slices.get(0.18e-6)!, slices.get(0.18e-6)!], gates, ib, { ...widen, wmin: 1e-3 })).toBeNull();
  });
});
