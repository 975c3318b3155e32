// Tests of the synthetic demo kits. All kit data is INVENTED ("Larkspur Microsystems" is a fictional foundry).
import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { gunzipSync } from 'node:zlib';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { StackwrightError } from '../src/errors.js';
import {
  DEMO_KITS,
  atCorner,
  centralDifferences,
  csvFileName,
  evalDevice,
  fmt6,
  kitJson,
  synthCsv,
  synthReadme,
  writeSynthKits,
  type DeviceParams,
  type EkvParams,
} from '../src/synth/index.js';

// Exact SI 2019 defining constants (BIPM SI brochure, 9th edition).
const K_B = 1.380649e-23;
const Q_E = 1.602176634e-19;
const EPS0 = 8.8541878128e-12; // CODATA 2018
const REPO = join(import.meta.dirname, '..');

/** A long-channel device: every short-channel effect switched off. */
function longChannel(over: Partial<DeviceParams> = {}): EkvParams {
  const dev: DeviceParams = {
    ...DEMO_KITS.demo180.devices.n,
    theta: 0,
    vsat: Infinity,
    dibl: 0,
    vaPerLength: Infinity,
    ...over,
  };
  return atCorner(dev, { temperature: 27, dvt: 0, muFactor: 1 });
}

// Quantities computed here from the published formulas, not from src/synth.
function ut(p: EkvParams): number {
  return (K_B * (p.temperature + 273.15)) / Q_E;
}
function slope(p: EkvParams, vsb: number): number {
  return 1 + p.gamma / (2 * Math.sqrt(p.phi + vsb)); // Enz & Vittoz 2006, n from γ
}
function specific(p: EkvParams, l: number, w: number, vsb: number): number {
  const cox = (3.9 * EPS0) / p.tox;
  return 2 * slope(p, vsb) * p.mu * cox * ut(p) ** 2 * (w / l); // IS = 2nμCoxUT²W/L, Enz & Vittoz 2006
}
function vth(p: EkvParams, vsb: number): number {
  return p.vt0 + p.gamma * (Math.sqrt(p.phi + vsb) - Math.sqrt(p.phi)); // body effect, common practice
}

/** VGS where the model's ID equals `target`, by bisection on the model itself. */
function vgsFor(p: EkvParams, target: number, b: { l: number; w: number; vds: number; vsb: number }): number {
  let lo = -1;
  let hi = 20;
  for (let k = 0; k < 200; k++) {
    const mid = (lo + hi) / 2;
    if (evalDevice(p, { ...b, vgs: mid }).id < target) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}

const logSweep = (from: number, to: number, n: number): number[] =>
  Array.from({ length: n }, (_, i) => from * (to / from) ** (i / (n - 1)));

describe('thermal voltage', () => {
  it('UT = kT/q at 300 K', () => {
    const p = longChannel();
    // kT/q at 300 K ≈ 25.85 mV (from memory); exact from the SI 2019 constants: 25.8520 mV.
    const at300 = atCorner({ ...DEMO_KITS.demo180.devices.n }, { temperature: 300 - 273.15, dvt: 0, muFactor: 1 });
    const id = evalDevice(at300, { l: 1e-6, w: 1e-6, vgs: 0.1, vds: 1, vsb: 0 });
    // In weak inversion gm/ID = 1/(n·UT) (Enz & Vittoz 2006), so gm/ID·n recovers 1/UT.
    const utModel = 1 / ((id.gm / id.id) * slope(at300, 0));
    expect(utModel * 1e3).toBeCloseTo(25.852, 2);
    expect(ut(p)).toBeCloseTo((K_B * 300.15) / Q_E, 15);
  });
});

describe('long-channel EKV limits (short-channel effects off)', () => {
  const l = 2e-6;
  const w = 1e-6;
  for (const vsb of [0, 0.6]) {
    it(`gm·n·UT/ID = 2/(1+√(1+4·IC)) from IC 1e-3 to 1e2, vsb ${vsb} V`, () => {
      const p = longChannel();
      const n = slope(p, vsb);
      const is = specific(p, l, w, vsb);
      for (const icTarget of logSweep(1e-3, 1e2, 16)) {
        const vgs = vgsFor(p, icTarget * is, { l, w, vds: 1.8, vsb });
        const d = evalDevice(p, { l, w, vgs, vds: 1.8, vsb });
        const ic = d.id / is;
        // Charge-based EKV inversion-coefficient relation (Enz & Vittoz 2006), in saturation.
        const expected = 2 / (1 + Math.sqrt(1 + 4 * ic));
        expect(Math.abs((d.gm * n * ut(p)) / d.id / expected - 1)).toBeLessThan(1e-3);
      }
    });
  }

  it('weak inversion: gm/ID → 1/(n·UT) and the swing is n·UT·ln10 per decade', () => {
    const p = longChannel();
    for (const vsb of [0, 0.3, 0.9]) {
      const n = slope(p, vsb);
      const is = specific(p, l, w, vsb);
      const b = { l, w, vds: 1.5, vsb };
      const vgs = vgsFor(p, 1e-6 * is, b);
      const d = evalDevice(p, { ...b, vgs });
      // Weak-inversion ceiling (Enz & Vittoz 2006), UT from the exact SI constants.
      expect(Math.abs((d.gm / d.id) * n * ut(p) - 1)).toBeLessThan(1e-5);
      // Subthreshold swing S = n·UT·ln(10) per decade (common practice).
      const vgs10 = vgsFor(p, 1e-5 * is, b);
      expect((vgs10 - vgs) / (n * ut(p) * Math.LN10)).toBeCloseTo(1, 4);
    }
  });

  it('strong inversion: gm/ID ≈ 2/(VGS − VT), the square-law value', () => {
    // EKV strong-inversion limit: i ≈ q², VP − VS ≈ 2·UT·q, VP − VS = (VGS − VT)/n, so
    // ID = IS·(VP−VS)²/(4UT²) = (μCox/2n)(W/L)(VGS − VT)² and gm/ID = 2/(VGS − VT)
    // (Enz & Vittoz 2006; square law is common practice). Residual is (2q + ln q)/(2q + 2) − 1 ≤ 2.4 %.
    const p = longChannel();
    for (const vsb of [0, 0.6]) {
      const is = specific(p, l, w, vsb);
      for (const ic of logSweep(1e2, 1e4, 9)) {
        // VDS far beyond VGS − VT so the reverse current is negligible (saturation).
        const vgs = vgsFor(p, ic * is, { l, w, vds: 40, vsb });
        const d = evalDevice(p, { l, w, vgs, vds: 40, vsb });
        const ratio = (d.gm / d.id) * ((vgs - vth(p, vsb)) / 2);
        expect(Math.abs(ratio - 1)).toBeLessThan(0.03);
      }
    }
  });

  it('intrinsic capacitances: 2/3·WLCox in saturation, 1/2 at VDS = 0, (n−1)/n·WLCox in weak inversion', () => {
    const p = longChannel({ cov: 0, cj: 0 });
    const wlcox = l * w * ((3.9 * EPS0) / p.tox);
    const n = slope(p, 0);
    const is = specific(p, l, w, 0);
    const strong = vgsFor(p, 1e4 * is, { l, w, vds: 5, vsb: 0 });
    // Meyer model, strong inversion: Cgs = 2/3·WLCox in saturation, Cgs = Cgd = WLCox/2 at VDS = 0 (common practice).
    expect(evalDevice(p, { l, w, vgs: strong, vds: 5, vsb: 0 }).cgs / wlcox).toBeCloseTo(2 / 3, 2);
    const lin = evalDevice(p, { l, w, vgs: strong, vds: 0, vsb: 0 });
    expect(lin.cgs / wlcox).toBeCloseTo(0.5, 2);
    expect(lin.cgd / wlcox).toBeCloseTo(0.5, 2);
    // Weak inversion: the gate sees Cox in series with the depletion capacitance, (n−1)/n·WLCox (common practice).
    expect(evalDevice(p, { l, w, vgs: 0, vds: 1, vsb: 0 }).cgg / wlcox).toBeCloseTo((n - 1) / n, 3);
  });
});

describe('analytic conductances', () => {
  it('match central differences of the drain current (definition of the derivative, O(h²) error)', () => {
    for (const kit of Object.values(DEMO_KITS)) {
      for (const dev of ['n', 'p'] as const) {
        for (const corner of Object.values(kit.corners)) {
          const p = atCorner(kit.devices[dev], corner);
          for (const nm of [kit.lengthsNm[0], kit.lengthsNm[kit.lengthsNm.length - 1]]) {
            for (let vgs = 0.1; vgs <= kit.supply; vgs += 0.3) {
              for (let vds = 0.05; vds <= kit.supply; vds += 0.25) {
                const b = { l: nm / 1e9, w: 1e-6, vgs, vds, vsb: 0.3 };
                const a = evalDevice(p, b);
                const [gm, gds, gmb] = centralDifferences(p, b);
                expect(Math.abs(gm / a.gm - 1)).toBeLessThan(1e-5);
                expect(Math.abs(gds / a.gds - 1)).toBeLessThan(1e-5);
                expect(Math.abs(gmb / a.gmb - 1)).toBeLessThan(1e-5);
              }
            }
          }
        }
      }
    }
  });
});

describe('fmt6', () => {
  it('prints what Number(x.toPrecision(6)).toString() prints (ECMAScript Number::toString)', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e30, max: 1e30 }), (x) => {
        expect(fmt6(x)).toBe(Number(x.toPrecision(6)).toString());
      }),
      { numRuns: 5000 },
    );
    expect(fmt6(-0)).toBe('0');
    expect(fmt6(0.15000000000000002)).toBe('0.15');
  });
});

/** Parsed demo CSV: comment lines and numeric rows. */
function readDemo(kit: string, dev: 'n' | 'p', corner: string): { text: string; comments: string[]; header: string; rows: number[][] } {
  const text = gunzipSync(readFileSync(join(REPO, 'demo-tables', kit, csvFileName(dev, corner)))).toString('utf8');
  const lines = text.trimEnd().split('\n');
  const comments = lines.filter((s) => s.startsWith('#'));
  const body = lines.filter((s) => !s.startsWith('#'));
  return { text, comments, header: body[0], rows: body.slice(1).map((s) => s.split(',').map(Number)) };
}

const CASES = Object.values(DEMO_KITS).flatMap((k) =>
  (['n', 'p'] as const).flatMap((dev) => Object.keys(k.corners).map((corner) => ({ kit: k, dev, corner }))),
);

describe('committed demo-tables', () => {
  it('equal a fresh generation (decompressed text, kit.json, README)', () => {
    expect(readFileSync(join(REPO, 'demo-tables', 'README.md'), 'utf8')).toBe(synthReadme());
    for (const k of Object.values(DEMO_KITS)) {
      expect(readFileSync(join(REPO, 'demo-tables', k.kit, 'kit.json'), 'utf8')).toBe(kitJson(k));
    }
    for (const { kit, dev, corner } of CASES) {
      const committed = readDemo(kit.kit, dev, corner).text;
      expect(committed === synthCsv(kit.kit, dev, corner), `${kit.kit}/${csvFileName(dev, corner)}`).toBe(true);
    }
  });

  it('stay under 25 MB together', () => {
    let total = 0;
    for (const k of Object.keys(DEMO_KITS)) {
      for (const f of readdirSync(join(REPO, 'demo-tables', k))) total += readFileSync(join(REPO, 'demo-tables', k, f)).length;
    }
    expect(total).toBeLessThan(25e6);
  });

  for (const { kit, dev, corner } of CASES) {
    it(`${kit.kit} ${dev}-${corner}: labelled invented, signed as a simulator reports, gds > 0, gain grows with L`, () => {
      const t = readDemo(kit.kit, dev, corner);
      expect(t.comments.join('\n')).toMatch(/INVENTED/);
      expect(t.comments.join('\n')).toMatch(/Larkspur Microsystems/);
      expect(t.header).toBe('l,w,vgs,vds,vsb,id,gm,gds,gmb,cgg,cgs,cgd,cdd');
      const nv = Math.round((kit.supply * 1000) / kit.vgsStepMv) + 1;
      const nd = Math.round((kit.supply * 1000) / kit.vdsStepMv) + 1;
      expect(t.rows.length).toBe(kit.lengthsNm.length * nv * nd * kit.vsbMv.length);
      const s = dev === 'p' ? -1 : 1;
      for (const r of t.rows) {
        expect(r.every(Number.isFinite)).toBe(true);
        // Simulator sign convention (SPICE: PMOS VGS, VDS, ID negative; vsb = vs − vb ≤ 0 under an n-well bulk).
        if (s * r[2] < 0 || s * r[3] < 0 || s * r[4] < 0 || s * r[5] < 0) throw new Error(`sign wrong in row ${r.join(',')}`);
        if (!(r[7] > 0)) throw new Error(`gds <= 0 in row ${r.join(',')}`);
      }
      expect(t.rows.some((r) => s * r[5] > 1e-6)).toBe(true);
      // Intrinsic gain gm/gds grows with L at fixed bias (channel-length modulation and DIBL fall with L;
      // common practice). Bias: |VGS| = VT0 + 0.2 V, |VDS| = VDD/2, VSB = 0, on the grid.
      const vgs = s * (Math.round(((kit.devices[dev].vt0 + 0.2) * 1000) / kit.vgsStepMv) * kit.vgsStepMv) / 1000;
      const vds = s * (Math.round((kit.supply * 500) / kit.vdsStepMv) * kit.vdsStepMv) / 1000;
      const gains = kit.lengthsNm.map((nm) => {
        const r = t.rows.find((x) => Math.abs(x[0] - nm * 1e-9) < 1e-12 && x[2] === vgs && x[3] === vds && x[4] === 0);
        if (!r) throw new Error(`no row at L ${nm} nm`);
        return r[6] / r[7];
      });
      for (let i = 1; i < gains.length; i++) expect(gains[i]).toBeGreaterThan(gains[i - 1]);
    });
  }

  it('porting demo180 → demo090 lowers the intrinsic gain at minimum L (scenario of the invented kits)', () => {
    const gainAt = (kit: string): number => {
      const k = DEMO_KITS[kit];
      const p = atCorner(k.devices.n, k.corners.tt);
      const d = evalDevice(p, { l: k.lmin, w: 1e-6, vgs: k.devices.n.vt0 + 0.2, vds: k.supply / 2, vsb: 0 });
      return d.gm / d.gds;
    };
    expect(gainAt('demo090')).toBeLessThan(0.6 * gainAt('demo180'));
  });
});

describe('model monotonicity on the demo grids', () => {
  it('id rises with VGS and VDS, gm/ID falls with VGS (common practice for a MOSFET)', () => {
    for (const k of Object.values(DEMO_KITS)) {
      for (const dev of ['n', 'p'] as const) {
        const p = atCorner(k.devices[dev], k.corners.tt);
        const l = k.lmin;
        for (let vds = 0.1; vds <= k.supply; vds += 0.2) {
          let prev = evalDevice(p, { l, w: 1e-6, vgs: 0, vds, vsb: 0.2 });
          for (let vgs = 0.02; vgs <= k.supply; vgs += 0.02) {
            const d = evalDevice(p, { l, w: 1e-6, vgs, vds, vsb: 0.2 });
            expect(d.id).toBeGreaterThan(prev.id);
            expect(d.gm / d.id).toBeLessThan(prev.gm / prev.id);
            expect(evalDevice(p, { l, w: 1e-6, vgs, vds: vds + 0.01, vsb: 0.2 }).id).toBeGreaterThan(d.id);
            prev = d;
          }
        }
      }
    }
  });
});

describe('writing and errors', () => {
  it('refuses to overwrite without force (kind exists), overwrites with force, leaves no temp files', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'synth-'));
    try {
      writeFileSync(join(dir, 'README.md'), 'old');
      await expect(writeSynthKits(dir, { kits: [] })).rejects.toMatchObject({ kind: 'exists' });
      expect(readFileSync(join(dir, 'README.md'), 'utf8')).toBe('old');
      await writeSynthKits(dir, { kits: [], force: true });
      expect(readFileSync(join(dir, 'README.md'), 'utf8')).toBe(synthReadme());
      expect(readdirSync(dir)).toEqual(['README.md']);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('bad input is a one-line StackwrightError saying where', () => {
    const p = longChannel();
    const cases: Array<() => unknown> = [
      () => synthCsv('demo999', 'n', 'tt'),
      () => synthCsv('demo180', 'n', 'hot'),
      () => synthCsv('demo180', 'x' as 'n', 'tt'),
      () => evalDevice(p, { l: -1e-6, w: 1e-6, vgs: 1, vds: 1, vsb: 0 }),
      () => evalDevice(p, { l: 1e-6, w: 1e-6, vgs: NaN, vds: 1, vsb: 0 }),
    ];
    for (const f of cases) {
      try {
        f();
        throw new Error('expected a StackwrightError');
      } catch (e) {
        expect(e).toBeInstanceOf(StackwrightError);
        expect((e as Error).message).not.toMatch(/\n/);
        expect((e as StackwrightError).where).toBeTruthy();
      }
    }
  });
});
