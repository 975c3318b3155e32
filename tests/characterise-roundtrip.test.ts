import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { cli } from './helpers/cli.js';
import { ngspiceStatus, TEST_LIB } from './fixtures/spice/ngspice.js';

// ngspice (Debian package) is the reference simulator here; the BSIM4 card is invented for tests (tests/fixtures/spice).
const status = ngspiceStatus();
const withNgspice = status === 'skip' ? describe.skip : describe;

const dir = mkdtempSync(join(tmpdir(), 'sw-roundtrip-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

// Card parameters of nch_test (tests/fixtures/spice/test-bsim4-cards.inc): overlap capacitance per width.
const CGDO = 3.2e-10;
const CGSO = 3.2e-10;
const W = 0.5e-6;
const SWEEP = ['--l', '0.5u,1u', '--w', '0.5u', '--vgs', '0:1.8:0.1', '--vds', '0:1.8:0.3', '--vsb', '0,0.4'];

/** Run `ngspice -b deck` in `cwd` as a user would; fail the test on a non-zero exit. */
function ngspice(deck: string, cwd: string): string {
  const r = spawnSync('ngspice', ['-b', deck], { cwd, encoding: 'utf8', timeout: 120_000 });
  expect(r.status, r.stdout + r.stderr).toBe(0);
  return r.stdout;
}

/**
 * Small-signal capacitances by an independent ngspice AC analysis at one bias point: with a 1 V AC source on
 * `drive`, the gate current is jω·C, so C = |Im i(vg)| / (2π f) (phasor form of i = C dv/dt, circuit theory).
 * Driving the drain gives Cgd; driving the gate gives Cgg.
 */
function acCapacitance(drive: 'g' | 'd', vgs: number, vds: number, l: number): number {
  const f = 1e6;
  const deck = [
    '* AC capacitance check (test only)',
    `.lib '${TEST_LIB}' tt`,
    `vg g 0 dc ${vgs} ac ${drive === 'g' ? 1 : 0}`,
    `vd d 0 dc ${vds} ac ${drive === 'd' ? 1 : 0}`,
    `m0 d g 0 0 nch_test w=${W} l=${l}`,
    '.control',
    `ac lin 1 ${f} ${f}`,
    'print imag(i(vg))',
    'quit',
    '.endc',
    '.end',
    '',
  ].join('\n');
  const file = join(dir, `ac-${drive}.cir`);
  writeFileSync(file, deck);
  const out = ngspice(file, dir);
  const m = /imag\(i\(vg\)\)\s*=\s*([-+0-9.eE]+)/.exec(out);
  expect(m, out).not.toBeNull();
  return Math.abs(Number(m![1])) / (2 * Math.PI * f);
}

function probe(kit: string, tables: string, l: string, vgs: number, vds: number): Record<string, number> {
  const r = cli(['probe', '--kit', kit, '--device', 'n', '--l', l, '--vgs', String(vgs), '--vds', String(vds), '--tables', tables, '--json']);
  expect(r.code, r.stderr).toBe(0);
  return JSON.parse(r.stdout) as Record<string, number>;
}

withNgspice('characterisation round trip (deck run in ngspice, then ingest)', () => {
  const tables = join(dir, 'tables');

  it('the deck that characterise --deck writes, run by the user in ngspice, gives a file ingest accepts as it is', () => {
    const deck = join(dir, 'nfet_tt.cir');
    const w = cli(['characterise', '--model', 'nch_test', '--device', 'n', '--include', `.lib '${TEST_LIB}' tt`, ...SWEEP, '--deck', deck]);
    expect(w.code, w.stderr).toBe(0);
    ngspice(deck, dir);
    const data = join(dir, 'nfet_tt.dat');
    expect(existsSync(data)).toBe(true);
    const r = cli(['ingest', data, '--kit', 'plain', '--device', 'n', '--tables', tables]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stderr).toMatch(/2 lengths .* 19 vgs x 7 vds x 2 vsb/);
    // Weak-inversion ceiling gm/ID < q/(kT) ≈ 38.7 /V at 27 °C (SI 2019 exact k and q; the slope factor n > 1).
    const p = probe('plain', tables, '1u', 0.3, 0.9);
    expect(p.gmid).toBeLessThan(1.602176634e-19 / (1.380649e-23 * 300.15));
    expect(p.gmid).toBeGreaterThan(15);
  });

  it('capacitances include overlap: cgd and cgg match an ngspice AC analysis and the card\'s cgdo·W', () => {
    // Saturation: the intrinsic gate-drain capacitance is nearly zero, so Cgd ≈ (cgdo + cf)·W (BSIM4 manual, overlap
    // capacitance with cgdl = 0, plus the fringing cf = (2·εox/π)·ln(1 + 0.4 µm/toxe), its default, BSIM4 manual):
    // (3.2e-10 + 1.01e-10) F/m × 0.5 µm = 0.21 fF, inside the 0.1–0.3 fF the issue expects.
    const cf = ((2 * 3.9 * 8.8541878128e-12) / Math.PI) * Math.log(1 + 4e-7 / 4.1e-9);
    const p = probe('plain', tables, '0.5u', 1.0, 1.5);
    expect(p.cgd).toBeGreaterThan((CGDO + cf) * W);
    expect(p.cgd).toBeLessThan((CGDO + cf) * W * 1.05);
    expect(p.cgd).toBeGreaterThan(0.1e-15);
    expect(p.cgd).toBeLessThan(0.3e-15);
    // The AC analysis includes every capacitance ngspice stamps (intrinsic, overlap, junction): table within 3 %.
    expect(Math.abs(p.cgd / acCapacitance('d', 1.0, 1.5, 0.5e-6) - 1)).toBeLessThan(0.03);
    expect(Math.abs(p.cgg / acCapacitance('g', 1.0, 1.5, 0.5e-6) - 1)).toBeLessThan(0.03);
    // Cgs in saturation ≈ (2/3)·Cox·W·L + cgso·W (textbook long-channel value plus overlap): at least the overlap.
    expect(p.cgs).toBeGreaterThan((CGSO + cf) * W);
  });

  it('a subcircuit-wrapped model (instance prefix x, own pin order) reads the inner device and gives the plain device\'s table', () => {
    // A wrapper as foundry kits ship them: pins in another order, the MOSFET inside named mcore.
    const lib = join(dir, 'wrapped.lib');
    writeFileSync(
      lib,
      [`* wrapper around the invented test card (tests only)`, `.lib '${TEST_LIB}' tt`, '.subckt nfet_wrapped gate drain bulk source w=1u l=1u', 'mcore drain gate source bulk nch_test w={w} l={l}', '.ends', ''].join('\n'),
    );
    const deck = join(dir, 'wrapped.cir');
    const args = ['characterise', '--model', 'nfet_wrapped', '--device', 'n', '--include', lib, ...SWEEP, '--instance', 'x', '--pins', 'g,d,b,s', '--inner', 'mcore', '--inner-model', 'nch_test'];
    const w = cli([...args, '--deck', deck]);
    expect(w.code, w.stderr).toBe(0);
    expect(readFileSync(deck, 'utf8')).toMatch(/^x0 g d0 b 0 nfet_wrapped w=500n l=500n$/m);
    ngspice(deck, dir);
    const r = cli(['ingest', join(dir, 'wrapped.dat'), '--kit', 'wrapped', '--device', 'n', '--tables', tables]);
    expect(r.code, r.stderr).toBe(0);
    for (const [vgs, vds] of [[0.4, 0.9], [1.0, 1.5], [1.8, 0.3]]) {
      const a = probe('wrapped', tables, '1u', vgs, vds);
      const b = probe('plain', tables, '1u', vgs, vds);
      for (const q of ['id', 'gm', 'gds', 'gmb', 'cgg', 'cgs', 'cgd', 'cdd']) expect(Math.abs(a[q] / b[q] - 1), `${q} at ${vgs}/${vds}`).toBeLessThan(1e-6);
    }
    // Without the inner device the deck cannot read an operating point: refused, naming the flag's key.
    const bad = cli([...args.filter((x, i, all) => x !== '--inner' && all[i - 1] !== '--inner'), '--deck', join(dir, 'bad.cir')]);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/characterise: inner: a subcircuit needs the name of the MOSFET inside it/);
  });
});
