import { spawnSync } from 'node:child_process';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { cli, ensureDemoTables, REPO } from './helpers/cli.js';
import { describe, expect, it } from 'vitest';
import { parseEng, parseEngShifted } from '../src/units/index.js';
import { parseSpec } from '../src/design/index.js';
import { scratchDir } from './helpers/scratch.js';

/**
 * The double nearest each exact decimal value, from Python's float() (correctly rounded
 * decimal-to-binary conversion, IEEE 754 round-to-nearest; Python docs, "Floating Point
 * Arithmetic: Issues and Limitations"). Returned as repr, which round-trips exactly.
 */
function nearestDoubles(decimals: string[]): number[] {
  const r = spawnSync('python3', ['-c', 'import sys\nfor s in sys.stdin.read().split(): print(repr(float(s)))'], { input: decimals.join('\n') });
  if (r.error) throw r.error;
  expect(r.status).toBe(0);
  return r.stdout.toString().trim().split('\n').map(Number);
}

describe('parseEng is exact in the decimal digits', () => {
  // [engineering text, the exact decimal value it denotes (SPICE3 scale factors, see units.test.ts)]
  const cases: Array<[string, string]> = [
    ['10u', '10e-6'],
    ['10uA', '10e-6'],
    ['200u', '200e-6'],
    ['0.2m', '0.2e-3'],
    ['3n', '3e-9'],
    ['0.18um', '0.18e-6'],
    ['1.1k', '1.1e3'],
    ['50meg', '50e6'],
    ['7p', '7e-12'],
    ['0.3f', '0.3e-15'],
    ['2.5e-3u', '2.5e-9'],
    ['-10u', '-10e-6'],
    ['.7n', '0.7e-9'],
    ['4.7µ', '4.7e-6'],
  ];
  it('every scaled value is the double nearest the exact decimal (Python float(), IEEE 754)', () => {
    const want = nearestDoubles(cases.map(([, d]) => d));
    cases.forEach(([text], k) => expect(parseEng(text), text).toBe(want[k]));
  });

  it('fails on the old product path: 10u is not 10 * 1e-6 (common practice / IEEE 754)', () => {
    // 10 * 1e-6 rounds twice and lands one ulp off the nearest double of 1e-5.
    expect(10 * 1e-6).not.toBe(1e-5);
    expect(parseEng('10u')).toBe(1e-5);
    expect(parseEng('200u')).toBe(2e-4);
  });

  it('a shift of the decimal point is exact too: "0.5" at -2 is 0.005 (percentages)', () => {
    const want = nearestDoubles(['0.5e-2', '0.07e-2', '1.1e-2', '3e-2']);
    expect([parseEngShifted('0.5', -2), parseEngShifted('0.07', -2), parseEngShifted('1.1', -2), parseEngShifted(3, -2)]).toEqual(want);
    // 0.07 / 100 is not the nearest double of 7e-4 (common practice / IEEE 754: two roundings).
    expect(0.07 / 100).not.toBe(7e-4);
  });

  it('MIL stays 25.4e-6 per unit (SPICE3 scale table; not a power of ten)', () => {
    expect(parseEng('1mil')).toBe(25.4e-6);
    expect(parseEng('2mil') / 50.8e-6).toBeCloseTo(1, 14);
  });
});

describe('spec values carry no float noise', () => {
  it('current 10u, wmax 200u, mismatch 0.07% parse to the nearest doubles of 1e-5, 2e-4, 7e-4 (Python float())', () => {
    const spec = parseSpec('kit: demo180\nsupply: 1.8\nstacks:\n  - name: s\n    device: n\n    topology: cascode\n    current: 10u\n    rout: 1meg\n    headroom: 0.3\n    wmax: 200u\n    mismatch: 0.07%\n', 'x.yaml');
    const [i, w, m] = nearestDoubles(['1e-5', '2e-4', '7e-4']);
    expect(spec.stacks[0].current).toBe(i);
    expect(spec.stacks[0].wmax).toBe(w);
    expect(spec.stacks[0].mismatch).toBe(m);
    expect(JSON.stringify(spec.stacks[0])).not.toMatch(/\d{12,}/);
  });
});

describe('size --json echoes spec values without float noise', () => {
  it('current 10u and wmax 200u print as 0.00001 and 0.0002 in the verdict and the result (Python float() repr)', () => {
    ensureDemoTables();
    const dir = scratchDir('sw-exact-');
    const file = join(dir, 'w.yaml');
    // Rout 100 MΩ at 0.3 V headroom needs wider devices than 200 µm here, so width binds and quotes wmax.
    writeFileSync(file, 'kit: demo180\nsupply: 1.8\nstacks:\n  - name: s\n    device: n\n    topology: cascode\n    current: 10u\n    rout: 100meg\n    headroom: 0.3\n    wmax: 200u\n');
    const r = cli(['size', file, '--json', '--tables', join(REPO, 'tables')]);
    const j = JSON.parse(r.stdout);
    const [i, w] = nearestDoubles(['10e-6', '200e-6']);
    expect(j.stacks[0].binding).toMatchObject({ target: 'width', required: w });
    expect(j.stacks[0].wmax).toBe(w);
    // Python's repr of the nearest doubles is the shortest round-trip text, as JSON.stringify prints it.
    expect(r.stdout).toContain('"required": 0.0002');
    expect(r.stdout).toContain('"current": 0.00001');
    // Every echo of a spec value (computed figures such as a device's solved id may differ in the last digits).
    const echoed = [...r.stdout.matchAll(/"(required|current|wmax)": ([^,\n}]+)/g)].map((m) => m[2]);
    expect(echoed.length).toBeGreaterThan(3);
    for (const v of echoed) expect(v).not.toMatch(/9999999|0000001/);
    expect(i).toBe(0.00001);
  });
});
