import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { cli } from './helpers/cli.js';
import { ngspiceStatus, TEST_LIB } from './fixtures/spice/ngspice.js';

// Under CI a missing ngspice makes the run test fail (it runs and cannot find the binary) rather than skip.
const NGSPICE_PRESENT = ngspiceStatus() !== 'skip';

const dir = mkdtempSync(join(tmpdir(), 'sw-char-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const base = ['characterise', '--model', 'nch_test', '--device', 'n', '--include', `.lib '${TEST_LIB}' tt`, '--l', '0.18u,0.5u,1u', '--vgs', '0:1.8:0.05', '--vds', '0:1.8:0.1', '--vsb', '0,0.4'];

describe('characterise (command line)', () => {
  it('writes a deck without running anything, and refuses bad ranges with the flag named', () => {
    const deck = join(dir, 'n.cir');
    const r = cli([...base, '--deck', deck]);
    expect(r.code, r.stderr).toBe(0);
    const text = readFileSync(deck, 'utf8');
    expect(text).toMatch(/nch_test/);
    expect(text).toMatch(/^\.end$/m);
    const bad = cli([...base.slice(0, -6), '--vgs', '1.8:0:0.05', '--deck', join(dir, 'x.cir')]);
    expect(bad.code).toBe(2);
    expect(bad.stderr.trim()).toMatch(/^stackwright: --vgs: expected FROM < TO/);
    expect(existsSync(join(dir, 'x.cir'))).toBe(false);
  });

  const run = NGSPICE_PRESENT ? it : it.skip;
  run('runs ngspice (Debian package, the reference simulator) into CSV that ingest and probe read', () => {
    const csv = join(dir, 'n.csv');
    const r = cli([...base, '--out', csv]);
    expect(r.code, r.stderr).toBe(0);
    const tables = join(dir, 'tables');
    expect(cli(['ingest', csv, '--kit', 'card', '--device', 'n', '--tables', tables]).code).toBe(0);
    const p = JSON.parse(cli(['probe', '--kit', 'card', '--device', 'n', '--l', '0.7u', '--vgs', '0.3', '--vds', '0.9', '--tables', tables, '--json']).stdout);
    // Weak-inversion ceiling: gm/ID < 1/UT = q/(kT) ≈ 38.7 /V at 27 °C (SI 2019 exact k and q); the slope factor n > 1
    // keeps a real device below it (common practice).
    expect(p.gmid).toBeLessThan(1.602176634e-19 / (1.380649e-23 * 300.15));
    expect(p.gmid).toBeGreaterThan(15);
  });
});

describe('characterise --out with a model file named relative to the current folder', () => {
  // The README's one-step flow: `characterise ... --include ".lib models.lib tt" --out nfet_tt.csv` run where the
  // models are. ngspice runs the deck in a folder of its own, so the path has to be taken from the user's folder.
  const run = NGSPICE_PRESENT ? it : it.skip;
  const models = join(TEST_LIB, '..');
  const small = ['characterise', '--model', 'nch_test', '--device', 'n', '--l', '0.18u', '--vgs', '0:1.8:0.3', '--vds', '0:1.8:0.6', '--vsb', '0'];
  run('a relative .lib line, quoted or not, runs and gives the same sweep as the absolute path', () => {
    const abs = join(dir, 'abs.csv');
    expect(cli([...small, '--include', `.lib '${TEST_LIB}' tt`, '--out', abs]).code).toBe(0);
    const rel = join(dir, 'rel.csv');
    const r = cli([...small, '--include', '.lib test-bsim4.lib tt', '--out', rel], { cwd: models });
    expect(r.code, r.stderr).toBe(0);
    expect(readFileSync(rel, 'utf8')).toBe(readFileSync(abs, 'utf8'));
    const quoted = join(dir, 'quoted.csv');
    expect(cli([...small, '--include', `.lib "./test-bsim4.lib" tt`, '--out', quoted], { cwd: models }).code).toBe(0);
    expect(readFileSync(quoted, 'utf8')).toBe(readFileSync(abs, 'utf8'));
  });

  it('a model file that does not exist is bad input (exit 2) naming --include, and nothing is written', () => {
    const out = join(dir, 'never.csv');
    for (const include of ['no-such-models.lib', '.lib no-such-models.lib tt']) {
      const r = cli([...small, '--include', include, '--out', out], { cwd: dir });
      expect(r.code, r.stderr).toBe(2);
      expect(r.stderr.trim()).toMatch(/^stackwright: --include .*no-such-models\.lib.*: model file not found$/);
    }
    expect(existsSync(out)).toBe(false);
  });
});
