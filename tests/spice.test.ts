import { describe, expect, it } from 'vitest';
import { StackwrightError } from '../src/errors.js';
import { CAUTION } from '../src/solve/types.js';
import {
  CHAR_COLUMNS,
  characterise,
  characterisationDeck,
  designNetlist,
  measuredHeadroom,
  parseWrdata,
  routOf,
  runNgspice,
  interpolateCurve,
  simulateOp,
  simulateSweep,
  stackNetlist,
  type CharacterisationOptions,
  type SweepPoint,
} from '../src/spice/index.js';
import { TEST_MODELS, libLine, ngspiceStatus } from './fixtures/spice/ngspice.js';
import { mirror, nCascode, nTriple, pStacked } from './fixtures/spice/stacks.js';

// Berkeley SPICE3 user's manual, "Number formats": scale factors (read independently of src/units).
const SPICE3: Record<string, number> = { t: 1e12, g: 1e9, meg: 1e6, k: 1e3, m: 1e-3, u: 1e-6, n: 1e-9, p: 1e-12, f: 1e-15 };
function spiceNumber(text: string): number {
  const m = /^([-+]?\d*\.?\d+(?:e[-+]?\d+)?)(meg|[tgkmunpf])?$/i.exec(text);
  if (!m) throw new Error(`not a SPICE3 number: ${text}`);
  return Number(m[1]) * (m[2] ? SPICE3[m[2].toLowerCase()] : 1);
}

// SPICE3 MOSFET element line: Mname nd ng ns nb model W=.. L=.. [m=..] (m: parallel instances, SPICE3 manual)
const M_LINE = /^m\S*\s+(\S+)\s+(\S+)\s+(\S+)\s+(\S+)\s+([A-Za-z_]\S*)\s+W=(\S+)\s+L=(\S+)(?:\s+m=(\d+))?\s*$/i;
const mLines = (net: string) => net.split('\n').filter((l) => /^m/i.test(l));
const elementLines = (net: string) => net.split('\n').filter((l) => l.trim() !== '' && !l.startsWith('*') && !l.startsWith('.'));

const base = { supply: 1.8, models: TEST_MODELS };

describe('stackNetlist text', () => {
  it('writes every M line with four nodes, a model, W and L, and sizes that read back', () => {
    for (const [s, bias, count] of [
      [nCascode, 'ideal', 2],
      [nCascode, 'diodes', 4],
      [pStacked, 'diodes', 4],
      [nTriple, 'ideal', 3],
    ] as const) {
      const net = stackNetlist(s, { ...base, bias });
      const lines = mLines(net);
      expect(lines).toHaveLength(count);
      for (const l of lines) expect(l).toMatch(M_LINE);
      // Output devices in order: W and L survive the scale suffixes (SPICE3 manual).
      s.devices.forEach((d) => {
        const line = lines.find((l) => l.startsWith(`m_s1_${d.role} `))!;
        const m = M_LINE.exec(line)!;
        // Wide devices are split into m fingers: total width W·m.
        expect(spiceNumber(m[6]) * Number(m[8] ?? 1)).toBeCloseTo(d.w, 12);
        expect(spiceNumber(m[7])).toBeCloseTo(d.l, 12);
        expect(m[5]).toBe(s.device === 'n' ? 'nch_test' : 'pch_test');
      });
    }
  });

  it('hangs p-type stacks from the supply and n-type stacks from ground', () => {
    const p = stackNetlist(pStacked, { ...base, bias: 'diodes' });
    const bottom = M_LINE.exec(mLines(p).find((l) => l.startsWith('m_s1_bottom '))!)!;
    expect([bottom[3], bottom[4]]).toEqual(['vdd', 'vdd']); // source and bulk on the rail
    const diode0 = M_LINE.exec(mLines(p).find((l) => l.startsWith('m_s1_bias0 '))!)!;
    expect(diode0[3]).toBe('vdd');
    const diode1 = M_LINE.exec(mLines(p).find((l) => l.startsWith('m_s1_bias1 '))!)!;
    expect(diode1[3]).toBe(diode0[1]); // stacked diode sits on the first one
    // Stacked diodes share one current: only the top one is fed, and it sinks to ground.
    const feeds = elementLines(p).filter((l) => /^i/i.test(l));
    expect(feeds).toHaveLength(1);
    expect(feeds[0].split(/\s+/).slice(1, 3)).toEqual([diode1[1], '0']);
    expect(p).toMatch(/^e_s1 out_s1 vdd vstack 0 -1$/m);

    const n = stackNetlist(nCascode, { ...base, bias: 'ideal' });
    const nb = M_LINE.exec(mLines(n).find((l) => l.startsWith('m_s1_bottom '))!)!;
    expect([nb[3], nb[4]]).toEqual(['0', '0']);
    const top = M_LINE.exec(mLines(n).find((l) => l.startsWith('m_s1_top '))!)!;
    expect(top[3]).toBe(nb[1]); // cascode source on the bottom drain
    expect(n).toMatch(/^vg_s1_top g_s1_top 0 dc 1$/m);
  });

  it('puts name, topology, targets, prediction and the caution in the header, and ends with .end', () => {
    const net = stackNetlist(nCascode, { ...base, spec: { current: 20e-6, rout: 20e6, headroom: 0.5, span: 1.6 } });
    const header = net.split('\n').filter((l) => l.startsWith('*')).join('\n');
    expect(header).toContain(CAUTION);
    expect(header).toContain('"sink": n-type cascode');
    expect(header).toMatch(/targets: iout 20 µA, rout >= 20 Mohm, headroom 500 mV, span 1\.6 V/);
    expect(net).toMatch(/^\.op$/m);
    expect(net).toMatch(/^\.dc vstack 0 1\.8 10m$/m);
    expect(net.trimEnd().endsWith('.end')).toBe(true);
    // Placeholder models with a hint when no include is given.
    expect(stackNetlist(nCascode, { supply: 1.8 })).toContain('nmos_model W=');
  });

  it('designNetlist writes every stack with its own prefix', () => {
    const net = designNetlist({ kit: 'k', corners: ['tt'], supply: 1.8, caution: CAUTION, stacks: [nCascode, pStacked] }, { ...base });
    expect(net).toMatch(/^\*@probe s1 n vm_s1 sink$/m);
    expect(net).toMatch(/^\*@probe s2 p vm_s2 source$/m);
    const names = elementLines(net).map((l) => l.split(/\s+/)[0].toLowerCase());
    expect(new Set(names).size).toBe(names.length); // SPICE needs unique element names
    // A stack the search could not size is noted, not written.
    const empty = { ...nTriple, name: 'none', feasible: false, binding: { target: 'rout' as const, required: 1e8, achieved: null, at: 0.5, device: null, corner: 'tt' }, devices: [] };
    const partial = designNetlist({ kit: 'k', corners: ['tt'], supply: 1.8, caution: CAUTION, stacks: [empty, nCascode] }, { ...base });
    expect(partial).toContain('stack "none": not sized (rout: no usable Rout at 0.500 V (outside the table); needs 100 MΩ)');
    expect(partial).not.toMatch(/^\*@probe s1 /m);
    expect(partial).toMatch(/^\*@probe s2 n vm_s2 sink$/m);
  });

  it('rejects bad input with one-line StackwrightErrors', () => {
    const noBias = () => stackNetlist(nTriple, { ...base, bias: 'diodes' });
    expect(noBias).toThrow(StackwrightError);
    expect(noBias).toThrow(/stack "deep".*bottom gate/);
    expect(() => stackNetlist(nCascode, { supply: 1.8, models: { n: 'bad name', p: 'x' } })).toThrow(/models\.n/);
    expect(() => stackNetlist(nCascode, { ...base, sweep: { from: 0, to: 2.5, step: 0.01 } })).toThrow(/netlist: sweep/);
    expect(() => stackNetlist({ ...nCascode, devices: [] }, base)).toThrow(/no sized devices/);
    expect(() => characterisationDeck({ ...charOpts('n'), lengths: [] })).toThrow(/characterise: lengths/);
    expect(() => characterisationDeck({ ...charOpts('n'), vgs: { from: 0, to: 1.8, step: 0 } })).toThrow(/vgs\.step/);
    expect(() => parseWrdata(' a b\n 1 2\n 3 x\n', 'f.dat')).toThrow(/f\.dat:3/);
  });
});

describe('sweep measurements', () => {
  // I(v) = I0(1 - exp(-v/tau)) + v/Rinf: dI/dv = (I0/tau)exp(-v/tau) + 1/Rinf, so Rout >= R
  // for v >= tau*ln((I0/tau) / (1/R - 1/Rinf)) (calculus on the model, by hand).
  const I0 = 20e-6;
  const tau = 0.05;
  const model = (rinf: number): SweepPoint[] =>
    Array.from({ length: 1801 }, (_, k) => {
      const v = k * 1e-3;
      return { v, iout: I0 * (1 - Math.exp(-v / tau)) + v / rinf };
    });

  it('central differences recover Ohm\'s law on a straight line', () => {
    const pts = Array.from({ length: 11 }, (_, k) => ({ v: k * 0.1, iout: 1e-6 + (k * 0.1) / 5e6 }));
    for (const p of routOf(pts)) expect(p.rout).toBeCloseTo(5e6, -1);
  });

  it('headroom matches the closed form when Rout binds', () => {
    const expected = tau * Math.log(I0 / tau / (1 / 2e7 - 1 / 1e8)); // 0.4605 V
    const h = measuredHeadroom(routOf(model(1e8)), { rout: 2e7, headroom: 0.5, span: 1.6 });
    expect(Math.abs(h - expected)).toBeLessThan(2e-3);
  });

  it('headroom follows the 1 % current window when it binds, and is Infinity when Rout never holds', () => {
    // Window: I(v) = 0.99 I(vmid), vmid = 1.05; solved by fixed-point iteration on the model.
    const rinf = 1e7;
    const iMid = I0 * (1 - Math.exp(-1.05 / tau)) + 1.05 / rinf;
    let v = 0.2;
    for (let k = 0; k < 200; k++) v = -tau * Math.log(1 - (0.99 * iMid - v / rinf) / I0);
    const h = measuredHeadroom(routOf(model(rinf)), { rout: 1e3, headroom: 0.5, span: 1.6 });
    expect(Math.abs(h - v)).toBeLessThan(2e-3);
    expect(measuredHeadroom(routOf(model(2e6)), { rout: 2e7, headroom: 0.5, span: 1.6 })).toBe(Infinity);
    expect(() => interpolateCurve(routOf(model(1e8)), 2.5)).toThrow(/outside the simulated sweep/);
  });
});

function charOpts(device: 'n' | 'p', corner = 'tt'): CharacterisationOptions {
  return {
    model: device === 'n' ? TEST_MODELS.n : TEST_MODELS.p,
    device,
    lengths: [0.18e-6, 0.72e-6, 1.44e-6],
    w: 1e-6,
    vgs: { from: 0, to: 1.8, step: 0.05 },
    vds: { from: 0.05, to: 1.8, step: 0.25 },
    vsb: [0, 0.4],
    supply: 1.8,
    include: libLine(corner),
  };
}

type Row = Record<(typeof CHAR_COLUMNS)[number], number>;
function rows(csv: string): Row[] {
  const [head, ...body] = csv.trim().split('\n');
  const names = head.split(',');
  return body.map((l) => Object.fromEntries(l.split(',').map((x, i) => [names[i], Number(x)])) as Row);
}

const status = ngspiceStatus();
const withNgspice = status === 'skip' ? describe.skip : describe;

describe('ngspice presence', () => {
  it('ngspice is installed when running under CI', () => {
    expect(status).not.toBe('fail');
  });
});

withNgspice('with ngspice (reference simulator, Debian package)', () => {
  it('runNgspice reports a missing binary and a broken deck as StackwrightErrors', async () => {
    await expect(runNgspice('x\n.end\n', { binary: 'ngspice-not-installed-here' })).rejects.toThrow(/not found on PATH/);
    await expect(runNgspice('x\nm1 d g 0 0 no_such_model w=1u l=1u\nvd d 0 1\nvg g 0 1\n.op\n.end\n')).rejects.toThrow(/^ngspice: ngspice failed .*line 2/);
    await expect(runNgspice("x\n.lib '/nonexistent/x.lib' tt\nvd d 0 1\nr1 d 0 1k\n.op\n.end\n")).rejects.toThrow(/x\.lib/);
    // A clean deck passes and returns the files it wrote.
    const ok = await runNgspice('x\nvd d 0 1\nr1 d 0 1k\n.control\nop\nwrdata out.dat v(d)\nquit\n.endc\n.end\n');
    expect(Object.keys(ok.files)).toEqual(['out.dat']);
  });

  it('parses the cascode netlists and gives the targets a sane shape', async () => {
    for (const bias of ['ideal', 'diodes'] as const) {
      const pts = routOf(await simulateSweep(stackNetlist(nCascode, { ...base, include: libLine('tt'), bias })));
      expect(pts).toHaveLength(181);
      // Saturated cascode: Rout far above a single device's (common practice).
      expect(interpolateCurve(pts, 1.2).rout).toBeGreaterThan(1e6);
      expect(interpolateCurve(pts, 0.05).rout).toBeLessThan(interpolateCurve(pts, 1.2).rout);
    }
  });

  it('.op of a 1:2 mirror gives twice the bias current when the drain voltages match', async () => {
    // Mirror relation Iout/Iref = (W/L)out/(W/L)ref at equal VDS (common practice, from memory).
    for (const dev of ['n', 'p'] as const) {
      const s = mirror(dev, 10e-6);
      const opts = { ...base, include: libLine('tt'), bias: 'diodes' as const };
      const first = await simulateOp(stackNetlist(s, opts));
      const diode = first.nodes['b0_s1'];
      const at = dev === 'n' ? diode : 1.8 - diode; // stack voltage equal to the diode's VDS
      const op = await simulateOp(stackNetlist(s, { ...opts, at }));
      expect(Math.abs(op.iout.s1 / 20e-6 - 1)).toBeLessThan(0.005);
      expect(Math.abs(first.iout.s1 / 20e-6 - 1)).toBeLessThan(0.1); // unequal VDS: only near
    }
  });

  it('characterises the test card into CSV with sane physics', async () => {
    const n = rows(await characterise(charOpts('n')));
    expect(n).toHaveLength(3 * 37 * 8 * 2);
    const p = rows(await characterise(charOpts('p')));
    // Simulator signs for PMOS: vgs, vds, id and vsb negative.
    expect(p.some((r) => r.vgs < 0) && p.every((r) => r.vgs <= 0 && r.vds < 0 && r.vsb <= 0 && r.id <= 0)).toBe(true);
    expect(n.every((r) => r.vgs >= 0 && r.id >= 0)).toBe(true);
    for (const tab of [n, p]) {
      const sat = tab.filter((r) => Math.abs(Math.abs(r.vds) - 0.8) < 1e-9 && r.vsb === 0 && Math.abs(r.id) > 1e-11);
      // gm/ID <= 1/(n·UT) with n >= 1, UT = kT/q = 25.85 mV at 27 °C (textbook subthreshold relation).
      const ceiling = Math.max(...sat.map((r) => r.gm / Math.abs(r.id)));
      expect(ceiling).toBeLessThan(1 / 0.02585);
      expect(ceiling).toBeGreaterThan(25); // the card aims at n ≈ 1.3 (common practice for bulk CMOS)
      // Intrinsic gain gm/gds at fixed gm/ID rises with L (common practice).
      const gainAt = (l: number) => {
        const r = sat.filter((x) => x.l === l).reduce((a, b) => (Math.abs(b.gm / Math.abs(b.id) - 10) < Math.abs(a.gm / Math.abs(a.id) - 10) ? b : a));
        return r.gm / r.gds;
      };
      expect(gainAt(0.72e-6)).toBeGreaterThan(gainAt(0.18e-6));
      expect(gainAt(1.44e-6)).toBeGreaterThan(gainAt(0.72e-6));
    }
    // Deep triode, strong inversion: Cgg ≈ Cox·W·L with Cox = εox/tox (textbook MOS capacitance).
    const cox = (3.9 * 8.854e-12) / 4.1e-9;
    const tri = n.find((r) => r.l === 1.44e-6 && r.vgs === 1.8 && r.vds === 0.05 && r.vsb === 0)!;
    // Plus the overlaps on both sides, (cgso + cf)·W + (cgdo + cf)·W from the card (cgso = cgdo = 3.2e-10 F/m;
    // cf = (2·εox/π)·ln(1 + 0.4 µm/toxe), its default in the BSIM4 manual).
    const cf = ((2 * 3.9 * 8.854e-12) / Math.PI) * Math.log(1 + 4e-7 / 4.1e-9);
    const cggExpected = cox * 1e-6 * 1.44e-6 + 2 * (3.2e-10 + cf) * 1e-6;
    expect(tri.cgg / cggExpected).toBeGreaterThan(0.85);
    expect(tri.cgg / cggExpected).toBeLessThan(1.05);
    // Saturation: the drain barely couples to the gate, Cgd << Cgs (textbook).
    const sat = n.find((r) => r.l === 1.44e-6 && r.vgs === 1 && r.vds === 1.55 && r.vsb === 0)!;
    expect(sat.cgd).toBeLessThan(0.05 * sat.cgs);
    // Body effect: more VSB, less current at the same VGS (textbook).
    const at = (vsb: number) => n.find((r) => r.l === 0.72e-6 && r.vgs === 0.8 && r.vds === 1.05 && r.vsb === vsb)!.id;
    expect(at(0.4)).toBeLessThan(at(0));
  });

  it('the ss section of the card is slower and hotter than tt', async () => {
    const tt = rows(await characterise({ ...charOpts('n'), lengths: [0.72e-6], vsb: [0] }));
    const ss = rows(await characterise({ ...charOpts('n', 'ss'), lengths: [0.72e-6], vsb: [0] }));
    const pick = (t: Row[]) => t.find((r) => r.vgs === 1.2 && r.vds === 1.05)!.id;
    expect(pick(ss)).toBeLessThan(0.9 * pick(tt));
    const run = await runNgspice(`t\n${libLine('ss')}\nvd d 0 1\nm1 d d 0 0 nch_test w=1u l=1u\n.op\n.end\n`);
    expect(run.stdout).toMatch(/TEMP = 85/);
  });
});
