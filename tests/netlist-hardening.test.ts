import { describe, expect, it } from 'vitest';
import { fingers, MAX_FINGER_WIDTH, routOf, interpolateCurve, simulateOp, simulateSweep, stackNetlist } from '../src/spice/index.js';
import { TEST_MODELS, libLine, ngspiceStatus } from './fixtures/spice/ngspice.js';
import { device, stack } from './fixtures/spice/stacks.js';

// SPICE3 manual, "Number formats" (read independently of src/units).
const SCALE: Record<string, number> = { meg: 1e6, k: 1e3, m: 1e-3, u: 1e-6, n: 1e-9, p: 1e-12 };
const spiceNumber = (t: string): number => {
  const m = /^([-+]?\d*\.?\d+(?:e[-+]?\d+)?)(meg|[kmunp])?$/i.exec(t);
  if (!m) throw new Error(`not a SPICE3 number: ${t}`);
  return Number(m[1]) * (m[2] ? SCALE[m[2].toLowerCase()] : 1);
};

const wide = stack('wide', 'n', 'cascode', [device('bottom', 47e-6, 1e-6, 0.6), device('top', 8e-6, 0.5e-6, 1.0)], []);
const spec = { current: 20e-6, rout: 1e6, headroom: 0.4, span: 1.6 };
const base = { supply: 1.8, models: TEST_MODELS, spec };

describe('netlist: wide devices as fingers', () => {
  it('splits a device wider than the finger limit into m equal fingers that add up to W', () => {
    // Fewest fingers of equal width not above the limit: ceil(W / limit).
    expect(fingers(47e-6)).toEqual({ count: 5, width: 47e-6 / 5 });
    expect(fingers(10e-6)).toEqual({ count: 1, width: 10e-6 });
    expect(fingers(3e-6, 1e-6).count).toBe(3);
    const net = stackNetlist(wide, base);
    const bottom = /^m_s1_bottom .* W=(\S+) L=(\S+) m=(\d+)$/m.exec(net)!;
    expect(Number(bottom[3])).toBe(5);
    expect(spiceNumber(bottom[1])).toBeLessThanOrEqual(MAX_FINGER_WIDTH);
    expect(spiceNumber(bottom[1]) * 5).toBeCloseTo(47e-6, 12);
    expect(net).toMatch(/^m_s1_top .* W=8u L=500n$/m); // narrow enough: one device, no m
  });
});

describe('netlist: .op at mid-span', () => {
  it('puts the stack voltage of the .op at (headroom + span)/2 (README definition), not supply/2', () => {
    const net = stackNetlist(wide, base);
    const v = /^vstack vstack 0 dc (\S+)$/m.exec(net)!;
    expect(spiceNumber(v[1])).toBeCloseTo(0.5 * (0.4 + 1.6), 12);
    expect(spiceNumber(v[1])).not.toBeCloseTo(0.9, 3);
  });
});

const withNgspice = ngspiceStatus() === 'skip' ? describe.skip : describe;
withNgspice('netlist with ngspice (reference simulator)', () => {
  it('m fingers draw the same current as the same fingers written out as separate devices', async () => {
    // SPICE3: an instance multiplier m is m identical devices in parallel. Checked against the
    // explicit parallel deck on the repo's BSIM4 test card.
    const net = stackNetlist(wide, { ...base, include: libLine('tt') });
    const op = await simulateOp(net);
    const lines = net.split('\n');
    const k = lines.findIndex((l) => l.startsWith('m_s1_bottom '));
    const m = /^(m_s1_bottom .* W=\S+ L=\S+) m=(\d+)$/.exec(lines[k])!;
    const parallel = Array.from({ length: Number(m[2]) }, (_, j) => m[1].replace('m_s1_bottom', `m_s1_bottom_f${j}`));
    const explicit = [...lines.slice(0, k), ...parallel, ...lines.slice(k + 1)].join('\n');
    const op2 = await simulateOp(explicit);
    expect(Math.abs(op.iout.s1 / op2.iout.s1 - 1)).toBeLessThan(1e-6);
  });

  it('the .op current is the swept current at mid-span', async () => {
    const net = stackNetlist(wide, { ...base, include: libLine('tt') });
    const op = await simulateOp(net);
    const swept = interpolateCurve(routOf(await simulateSweep(net)), 1.0);
    expect(Math.abs(op.iout.s1 / swept.iout - 1)).toBeLessThan(1e-3);
  });
});
