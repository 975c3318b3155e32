import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cli, ensureDemoTables, REPO } from './helpers/cli.js';

let dir: string;
beforeAll(() => {
  ensureDemoTables();
  dir = mkdtempSync(join(tmpdir(), 'sw-harden-'));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const tables = () => join(REPO, 'tables');
const DEMO = join('demo-tables', 'specs', 'marsh-wren.yaml');

/** Exit status, one stderr line starting with the program name, nothing on stdout. */
function expectOneLineError(r: { code: number; stdout: string; stderr: string }, code: number, re: RegExp): void {
  expect(r.code, r.stderr).toBe(code);
  const lines = r.stderr.trim().split('\n');
  expect(lines).toHaveLength(1);
  expect(lines[0]).toMatch(/^stackwright: /);
  expect(lines[0]).toMatch(re);
  expect(r.stdout).toBe('');
}

describe('output paths that cannot be created', () => {
  // Under /proc, mkdir answers ENOENT although the parent exists; recursive mkdir used to loop on it.
  it('chart, size --report, size --front and synth fail at once with exit 2', () => {
    expectOneLineError(cli(['chart', '--kit', 'demo180', '--device', 'n', '--out', '/proc/nope', '--tables', tables()]), 2, /cannot create folder \/proc\/nope: no such file or directory \(ENOENT\)/);
    expectOneLineError(cli(['size', DEMO, '--report', '/proc/x/r.html', '--tables', tables()]), 2, /cannot create folder \/proc\/x: /);
    expectOneLineError(cli(['size', DEMO, '--front', '/proc/x/f.csv', '--tables', tables()]), 2, /cannot create folder \/proc\/x: /);
    expectOneLineError(cli(['synth', '--out', '/proc/nope']), 2, /cannot create folder \/proc\/nope\/demo\d+: /);
  });

  it('a file in the way of a folder is named as such', () => {
    const file = join(dir, 'plain-file');
    writeFileSync(file, 'x');
    expectOneLineError(cli(['chart', '--kit', 'demo180', '--device', 'n', '--out', join(file, 'sub'), '--tables', tables()]), 2, /cannot create folder .*plain-file\/sub: not a directory \(ENOTDIR\)/);
  });

  it('still creates nested folders that do not exist yet', () => {
    const out = join(dir, 'a', 'b', 'c');
    const r = cli(['chart', '--kit', 'demo180', '--device', 'n', '--out', out, '--tables', tables()]);
    expect(r.code, r.stderr).toBe(0);
    expect(existsSync(join(out, 'demo180-n-tt-gain.svg'))).toBe(true);
  });
});

describe('a supply above the tables', () => {
  const spec = (supply: string) => `kit: demo180\nsupply: ${supply}\nstacks:\n  - name: sink\n    device: n\n    topology: cascode\n    current: 10u\n    rout: 10meg\n    headroom: 0.4\n`;

  it('is one exit-2 message for size, --brief, --json and --report, and nothing is written', () => {
    const path = join(dir, 'high-supply.yaml');
    writeFileSync(path, spec('2.5'));
    const report = join(dir, 'high', 'r.html');
    const want = /stacks\[0\]\.span: span 2\.5 V \(the span is the supply when not given\) is above the tables' VDS range, which ends at 1\.8 V \(kit demo180, n-type, corner tt\)/;
    for (const extra of [[], ['--brief'], ['--json'], ['--report', report]]) {
      expectOneLineError(cli(['size', path, '--tables', tables(), ...extra]), 2, want);
    }
    expect(existsSync(report)).toBe(false);
  });

  it('is the same one exit-2 message for a spec with only stages, and nothing is written', () => {
    // A stage's output swings between the rails, so a single-device side sees up to the whole
    // supply as VDS (common practice: the output node of a common-source stage); tables ending at
    // 1.8 V cannot describe a 2.5 V stage, which sized silently before.
    const path = join(dir, 'high-supply-stage.yaml');
    writeFileSync(path, 'kit: demo180\nsupply: 2.5\nstages:\n  - name: amp\n    current: 10u\n    gain: 300\n    swing: 0.5\n    input: {device: n, topology: single}\n');
    const report = join(dir, 'high-stage', 'r.html');
    const want = /high-supply-stage\.yaml: supply: supply 2\.5 V is above the tables' VDS range, which ends at 1\.8 V \(kit demo180, n-type, corner tt\); stage "amp"/;
    for (const extra of [[], ['--brief'], ['--json'], ['--report', report]]) {
      expectOneLineError(cli(['size', path, '--tables', tables(), ...extra]), 2, want);
    }
    expect(existsSync(report)).toBe(false);
  });

  it('port --supply above the new kit is bad input (exit 2), naming the flag', () => {
    expectOneLineError(cli(['port', DEMO, '--to', 'demo090', '--supply', '5', '--tables', tables()]), 2, /--supply: 5 V is above the VDS range of kit demo090's tables, which ends at 1\.2 V/);
    expectOneLineError(cli(['port', DEMO, '--to', 'demo090', '--supply', '-1', '--tables', tables()]), 2, /--supply: expected a positive supply, got -1 V/);
  });
});

describe('a spec length range outside the table', () => {
  const spec = (l: string) => `kit: demo180\nsupply: 1.8\nstacks:\n  - name: sink\n    device: n\n    topology: cascode\n    current: 10u\n    rout: 1meg\n    headroom: 0.3\n    span: 1.6\n    l: ${l}\n`;
  // Sizing never extrapolates beyond the table (DEVELOPERS.md), so the range is cut to it; the user is told.
  it('is cut to the table with a printed note, and no note when it fits', () => {
    const path = join(dir, 'wide-l.yaml');
    writeFileSync(path, spec('[0.01u, 50u]'));
    const r = cli(['size', path, '--brief', '--tables', tables()]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stderr).toMatch(/^note: sink: L range 10 nm\.\.50 µm reaches outside the table lengths \(180 nm\.\.2 µm, corner tt\); sized within 180 nm\.\.2 µm$/m);
    writeFileSync(path, spec('[0.5u, 1u]'));
    expect(cli(['size', path, '--brief', '--tables', tables()]).stderr).not.toMatch(/note:/);
  });
});

describe('netlist from size --json', () => {
  it('places the .op at the mid-span of the spec the JSON came from', () => {
    const path = join(dir, 'one.yaml');
    writeFileSync(path, 'kit: demo180\nsupply: 1.8\nstacks:\n  - name: one\n    device: n\n    topology: single\n    current: 10u\n    rout: 200k\n    headroom: 0.3\n    span: 1.3\n');
    const r = cli(['size', path, '--json', '--tables', tables()]);
    const json = join(dir, 'one.json');
    writeFileSync(json, r.stdout);
    const net = cli(['netlist', json]);
    expect(net.code, net.stderr).toBe(0);
    // Mid-span = (headroom + span)/2 = 0.8 V (README definition), not supply/2 = 0.9 V.
    expect(net.stdout).toMatch(/^vstack vstack 0 dc 800m$/m);
  });
});

describe('probe flags that must be positive', () => {
  // gm/ID, ID/W and W of a conducting transistor are positive (common practice); a zero or negative value is a
  // typing mistake to be named by its flag, with the value as typed rather than a raw float such as -0.000001.
  it('--gmid, --jd and --w at zero or below are one exit-2 line naming the flag', () => {
    const base = ['probe', '--kit', 'demo180', '--device', 'n', '--l', '0.5u', '--tables', tables()];
    expectOneLineError(cli([...base, '--gmid', '0']), 2, /^stackwright: --gmid: expected a positive value, got "0"$/);
    expectOneLineError(cli([...base, '--jd', '-1']), 2, /^stackwright: --jd: expected a positive value, got "-1"$/);
    expectOneLineError(cli([...base, '--vgs', '0.7', '--w', '-1u']), 2, /^stackwright: --w: expected a positive value, got "-1u"$/);
    // A positive value still probes.
    expect(cli([...base, '--gmid', '12', '--w', '2u', '--json']).code).toBe(0);
  });
});
