import { describe, expect, it } from 'vitest';
import { ekv, sliceOf } from './helpers/analytic-slice.js';
import { FIXED_VDS } from './helpers/fixed-cascode.js';
import { sizeStack, type KitAccess } from '../src/solve/index.js';
import { parseSpec } from '../src/design/index.js';
import { topologyNames, topologyOf, registerTopology } from '../src/topology/index.js';
import { solveOperatingPoint } from '../src/stack/index.js';
import type { StackSpec } from '../src/design/types.js';

// Analytic kit with invented parameters (not any real process).
const LENGTHS = [0.18e-6, 0.25e-6, 0.35e-6, 0.5e-6, 0.7e-6, 1e-6, 1.4e-6, 2e-6];
const model = (l: number) => ekv({ l, vt0: 0.45, kp: 250e-6, n: 1.35, lambda: 0.05e-6 / l });
const kit: KitAccess = {
  kit: 'analytic', corners: ['tt'],
  lengths: () => Float64Array.from(LENGTHS),
  slice: (_c, _d, l) => sliceOf(l, model(l)),
  mismatch: () => undefined,
};
const spec: StackSpec = {
  name: 'sink', device: 'n', topology: 'fixed-cascode', current: 20e-6, rout: 50e6, headroom: 0.5, span: 1.8, objective: 'area',
};

describe('a topology added in one file', () => {
  it('is registered by that file alone and known to the spec parser', () => {
    expect(topologyNames()).toContain('fixed-cascode');
    expect(topologyOf('fixed-cascode').roles).toEqual(['bottom', 'top']);
    const parsed = parseSpec('kit: analytic\nsupply: 1.8\nstacks:\n  - {name: s, device: n, topology: fixed-cascode, current: 20u, rout: 50meg, headroom: 0.5}\n', 't.yaml');
    expect(parsed.stacks[0].topology).toBe('fixed-cascode');
    // A name can be registered once only.
    expect(() => registerTopology(topologyOf('fixed-cascode'))).toThrow(/already taken/);
  });

  it('sizes a stack that meets its targets, checked by an independent DC solve and the cascode Rout formula', () => {
    const r = sizeStack(spec, kit, { supply: 1.8, corners: ['tt'] }).results[0];
    expect(r.topology).toBe('fixed-cascode');
    expect(r.feasible).toBe(true);
    expect(r.devices.map((d) => d.role)).toEqual(['bottom', 'top']);
    expect(r.bias).toHaveLength(2);
    // Re-solve the reported W, L and gates at mid-span on the model: KCL gives the target current (1 % window).
    const vmid = 0.5 * (spec.headroom + spec.span);
    const devices = r.devices.map((d) => ({ slice: sliceOf(d.l, model(d.l)), w: d.w }));
    const op = solveOperatingPoint(devices, r.devices.map((d) => d.gate), vmid);
    expect(Math.abs(op.i / spec.current - 1)).toBeLessThanOrEqual(0.01);
    // The bottom drain sits near the screened setpoint (refinement moves it by at most a few 12.5 mV steps).
    expect(Math.abs(op.nodes[1] - FIXED_VDS)).toBeLessThan(0.1);
    // Cascode output resistance Rout ≈ ro2 + (1 + (gm2 + gmb2)·ro2)·ro1 (common practice; e.g. Gray, Hurst, Lewis & Meyer).
    const [b, t] = op.devices;
    const hand = 1 / t.gds + (1 + (t.gm + t.gmb) / t.gds) / b.gds;
    expect(hand).toBeGreaterThanOrEqual(spec.rout);
    expect(r.predicted.rout / hand).toBeGreaterThan(0.5);
    expect(r.predicted.rout / hand).toBeLessThan(2);
  });
});
