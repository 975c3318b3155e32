import { existsSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cli, ensureDemoTables, REPO } from './helpers/cli.js';

let dir: string;
beforeAll(() => {
  ensureDemoTables();
  dir = mkdtempSync(join(tmpdir(), 'sw-cli-'));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const tables = () => join(REPO, 'tables');

/** One line on stderr starting with the program name, and nothing on stdout. */
function expectOneLineError(r: { code: number; stdout: string; stderr: string }, code: number, re: RegExp): void {
  expect(r.code).toBe(code);
  const lines = r.stderr.trim().split('\n');
  expect(lines).toHaveLength(1);
  expect(lines[0]).toMatch(/^stackwright: /);
  expect(lines[0]).toMatch(re);
}

const SPEC = `kit: demo180
supply: 1.8
stacks:
  - name: sink
    device: n
    topology: cascode
    current: 20u
    rout: 20meg
    headroom: 0.5
    span: 1.6
`;

describe('cli conventions', () => {
  it('every command has --help with an example', () => {
    for (const cmd of ['synth', 'ingest', 'probe', 'chart', 'kits', 'size', 'netlist', 'port', 'characterise']) {
      const r = cli([cmd, '--help']);
      expect(r.code, cmd).toBe(0);
      expect(r.stdout, cmd).toMatch(/Example:\n  stackwright /);
    }
  });

  it('probe prints data on stdout, JSON with --json, and no colour codes when NO_COLOR is set', () => {
    const r = cli(['probe', '--kit', 'demo180', '--device', 'n', '--l', '0.5u', '--gmid', '12', '--tables', tables()]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/gm\/ID\s+12 1\/V/);
    expect(r.stdout).not.toMatch(/\x1b\[/);
    const j = cli(['probe', '--kit', 'demo180', '--device', 'n', '--l', '0.5u', '--gmid', '12', '--json', '--tables', tables()]);
    const op = JSON.parse(j.stdout);
    expect(op.gmid).toBeCloseTo(12, 6);
    // gm/ID is gm over ID (definition)
    expect(op.gm / op.id).toBeCloseTo(op.gmid, 9);
  });

  it('out-of-table queries name the axis and exit 2', () => {
    expectOneLineError(cli(['probe', '--kit', 'demo180', '--device', 'n', '--l', '5u', '--vgs', '0.6', '--tables', tables()]), 2, /l = 5 µm is outside the table range \[180 nm, 2 µm\]/);
    expectOneLineError(cli(['probe', '--kit', 'demo180', '--device', 'n', '--l', '1u', '--gmid', '45', '--tables', tables()]), 2, /gmid = 45 1\/V is above what the table reaches/);
    expectOneLineError(cli(['probe', '--kit', 'demo180', '--device', 'n', '--l', '1u', '--vgs', '0.5', '--vds', '2.5', '--tables', tables()]), 2, /vds/);
  });

  it('flag values use engineering notation and bad ones name the flag', () => {
    expectOneLineError(cli(['probe', '--kit', 'demo180', '--device', 'n', '--l', '0.5M', '--vgs', '0.6']), 2, /--l: .*meg/);
    expectOneLineError(cli(['probe', '--kit', 'demo180', '--device', 'x', '--l', '0.5u', '--vgs', '0.6']), 2, /--device: expected n or p/);
    expectOneLineError(cli(['probe', '--kit', 'demo180', '--device', 'n', '--l', '0.5u']), 2, /exactly one of --gmid, --vgs, --jd/);
    expectOneLineError(cli(['probe', '--kit', 'nosuchkit', '--device', 'n', '--l', '0.5u', '--vgs', '0.5', '--tables', tables()]), 2, /nosuchkit/);
  });
});

describe('ingest from the command line', () => {
  const good = 'l,w,vgs,vds,id\n' + [1e-6, 2e-6].flatMap((l) =>
    [0.4, 0.6, 0.8].flatMap((vgs) => [0, 0.5, 1].map((vds) => `${l},1e-6,${vgs},${vds},${(1e-4 * (vgs - 0.3) ** 2 * Math.tanh(vds / 0.1) * (1 + 0.1 * vds) * 1e-6 / l).toExponential(6)}`)),
  ).join('\n') + '\n';

  it('writes a table, refuses to overwrite it without --force, and leaves it untouched', () => {
    const csv = join(dir, 'ok.csv');
    writeFileSync(csv, good);
    const out = join(dir, 'tables');
    const r = cli(['ingest', csv, '--kit', 'tiny', '--device', 'n', '--tables', out]);
    expect(r.code, r.stderr).toBe(0);
    const path = join(out, 'tiny', 'n-tt.swtab');
    const before = readFileSync(path);
    expectOneLineError(cli(['ingest', csv, '--kit', 'tiny', '--device', 'n', '--tables', out]), 2, /exists; pass --force/);
    expect(readFileSync(path).equals(before)).toBe(true);
    expect(cli(['ingest', csv, '--kit', 'tiny', '--device', 'n', '--tables', out, '--force']).code).toBe(0);
    const k = JSON.parse(cli(['kits', '--tables', out, '--json']).stdout);
    expect(k.kits[0].kit).toBe('tiny');
    expect(Object.keys(k.kits[0].tables[0].derived).sort()).toEqual(['gds', 'gm']);
  });

  it('a bad cell gives file:line:column and writes nothing', () => {
    const csv = join(dir, 'bad.csv');
    const lines = good.split('\n');
    lines[4] = lines[4].replace(/,([^,]*)$/, ',abc');
    writeFileSync(csv, lines.join('\n'));
    const out = join(dir, 'bad-tables');
    const r = cli(['ingest', csv, '--kit', 'tiny', '--device', 'n', '--tables', out]);
    expectOneLineError(r, 2, new RegExp(`bad\\.csv:5:\\d+: .*abc`));
    expect(existsSync(join(out, 'tiny'))).toBe(false);
  });

  it('an unknown --map quantity lists the valid ones', () => {
    const csv = join(dir, 'ok2.csv');
    writeFileSync(csv, good);
    expectOneLineError(cli(['ingest', csv, '--kit', 't', '--device', 'n', '--map', 'id=current', '--tables', join(dir, 'x')]), 2, /current.*vgs/);
  });

  it('refuses implausible --avt and --temperature at ingest with the plausible range, writing nothing', () => {
    const csv = join(dir, 'ok3.csv');
    writeFileSync(csv, good);
    const out = join(dir, 'cond-tables');
    // Absolute zero is -273.15 °C (SI); A_VT is positive (Pelgrom et al., IEEE JSSC 1989).
    expectOneLineError(cli(['ingest', csv, '--kit', 't', '--device', 'n', '--avt', '-5', '--abeta', '1', '--tables', out]), 2, /^stackwright: --avt: A_VT -5 mV·µm is implausible; expected 0\.1 to 50 mV·µm/);
    expectOneLineError(cli(['ingest', csv, '--kit', 't', '--device', 'n', '--temperature', '-500', '--tables', out]), 2, /--temperature: .*expected -60 °C to 200 °C/);
    expectOneLineError(cli(['ingest', csv, '--kit', 't', '--device', 'n', '--temperature', '900', '--tables', out]), 2, /--temperature: temperature 900 °C/);
    expect(existsSync(join(out, 't'))).toBe(false);
  });
});

describe('size from the command line', () => {
  it('prints the JSON shape of the contract and exits 0 when feasible', () => {
    const spec = join(dir, 'ok.yaml');
    writeFileSync(spec, SPEC);
    const r = cli(['size', spec, '--json', '--tables', tables()]);
    expect(r.code, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    const s = j.stacks[0];
    expect(s).toMatchObject({ name: 'sink', device: 'n', topology: 'cascode', feasible: true });
    for (const k of ['role', 'w', 'l', 'gate', 'vgs', 'vds', 'vsb', 'gmid', 'id', 'gm', 'gds']) expect(s.devices[0]).toHaveProperty(k);
    for (const k of ['w', 'l', 'current', 'voltage']) expect(s.bias[0]).toHaveProperty(k);
    for (const k of ['iout', 'rout', 'headroom', 'area']) expect(typeof s.predicted[k]).toBe('number');
    expect(s.devices.map((d: { role: string }) => d.role)).toEqual(['bottom', 'top']);
    expect(s.curve[0].v).toBe(0);
    expect(s.curve.at(-1).v).toBeCloseTo(1.6, 9);
    expect(s.predicted.rout).toBeGreaterThanOrEqual(20e6);
    expect(s.predicted.headroom).toBeLessThanOrEqual(0.5);
    expect(Math.abs(s.predicted.iout - 20e-6) / 20e-6).toBeLessThan(0.01);
    expect(j.caution).toMatch(/Verify them by simulation/);
  });

  it('--brief prints one line per stack', () => {
    const spec = join(dir, 'brief.yaml');
    writeFileSync(spec, SPEC);
    const r = cli(['size', spec, '--brief', '--tables', tables()]);
    expect(r.code, r.stderr).toBe(0);
    const rows = r.stdout.split('\n').filter((l) => l.startsWith('sink '));
    expect(rows).toHaveLength(1);
    // W/L in µm without units (the header says µm), to fit 120 columns (meant to change).
    expect(rows[0]).toMatch(/n-type cascode\s+feasible\s+[\d.]+\/[\d.]+ \+ [\d.]+\/[\d.]+ /);
  });

  it('exits 3 on an infeasible stack and names the binding target', () => {
    const spec = join(dir, 'hard.yaml');
    writeFileSync(spec, SPEC.replace('rout: 20meg', 'rout: 1t').replace('topology: cascode', 'topology: single'));
    const r = cli(['size', spec, '--tables', tables()]);
    expect(r.code).toBe(3);
    expect(r.stdout).toMatch(/INFEASIBLE/);
    expect(r.stderr).toMatch(/infeasible: sink \(rout/);
  });

  it('bad spec keys give the key path; outputs are all-or-nothing', () => {
    const spec = join(dir, 'bad.yaml');
    writeFileSync(spec, SPEC.replace('rout: 20meg', 'rout: twenty'));
    expectOneLineError(cli(['size', spec, '--tables', tables()]), 2, /bad\.yaml:8:11: stacks\[0\]\.rout: /);

    const ok = join(dir, 'ok2.yaml');
    writeFileSync(ok, SPEC);
    const existing = join(dir, 'out', 'stacks.cir');
    cli(['size', ok, '--netlist', existing, '--tables', tables()]);
    expect(existsSync(existing)).toBe(true);
    const report = join(dir, 'out', 'report.html');
    const r = cli(['size', ok, '--report', report, '--netlist', existing, '--tables', tables()]);
    expectOneLineError(r, 2, /stacks\.cir exists; pass --force/);
    expect(existsSync(report)).toBe(false);
    expect(readdirSync(join(dir, 'out')).filter((f) => f.endsWith('.tmp'))).toEqual([]);
    const f = cli(['size', ok, '--report', report, '--netlist', existing, '--front', join(dir, 'out', 'front.csv'), '--force', '--tables', tables()]);
    expect(f.code, f.stderr).toBe(0);
    expect(readFileSync(report, 'utf8')).toMatch(/<svg/);
    expect(readFileSync(join(dir, 'out', 'front.csv'), 'utf8').split('\n')[0]).toBe('stack,topology,feasible,headroom_V,rout_ohm,area_m2,l_m,gmid_per_V,w_m,vds_setpoints_V');
    expect(existsSync(join(dir, 'out', 'front.sink.svg'))).toBe(true);
  });

  it('netlist reads size --json back', () => {
    const ok = join(dir, 'ok3.yaml');
    writeFileSync(ok, SPEC);
    const json = join(dir, 'r.json');
    writeFileSync(json, cli(['size', ok, '--json', '--tables', tables()]).stdout);
    const r = cli(['netlist', json, '--model-n', 'nch']);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/^m\S+ \S+ \S+ \S+ \S+ nch W=\S+ L=\S+$/m);
    expect(r.stdout).toMatch(/^\.end$/m);
    writeFileSync(join(dir, 'junk.json'), '{"stacks": 3}');
    expectOneLineError(cli(['netlist', join(dir, 'junk.json')]), 2, /junk\.json: expected the JSON printed by/);
  });
});

describe('ingest tells what it did not keep', () => {
  // Invented square-law sweep (Shichman–Hodges level 1, textbook form) split by length over two files, one of them
  // with a cgg column: a quantity not in every file is dropped; the user hears it when ingesting, not only in `kits`.
  const rows = (l: number, withCgg: boolean) =>
    [0.4, 0.6, 0.8].flatMap((vgs) => [0, 0.5, 1].map((vds) => {
      const id = (1e-4 * (vgs - 0.3) ** 2 * Math.tanh(vds / 0.1) * 1e-6 / l).toExponential(6);
      return `${l},1e-6,${vgs},${vds},${id}${withCgg ? ',2e-15' : ''}`;
    }));
  const parts = (): [string, string] => {
    const a = join(dir, 'part-a.csv');
    const b = join(dir, 'part-b.csv');
    writeFileSync(a, ['l,w,vgs,vds,id,cgg', ...rows(1e-6, true)].join('\n') + '\n');
    writeFileSync(b, ['l,w,vgs,vds,id', ...rows(2e-6, false)].join('\n') + '\n');
    return [a, b];
  };
  it('a quantity present in only some files is named on stderr and in the JSON summary', () => {
    const [a, b] = parts();
    const out = join(dir, 'parts');
    const r = cli(['ingest', a, b, '--kit', 'parts', '--device', 'n', '--tables', out, '--note', 'mine']);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stderr).toMatch(/^note: cgg ignored: not in every file$/m);
    const j = cli(['ingest', a, b, '--kit', 'parts', '--device', 'n', '--tables', out, '--force', '--json']);
    expect(JSON.parse(j.stdout).importNote).toBe('cgg ignored: not in every file');
    // The user's own note (even one with the '; ' the stored note joins with) stays out of importNote.
    const noted = cli(['ingest', a, b, '--kit', 'parts2', '--device', 'n', '--tables', out, '--note', 'bench 3; run 7', '--json']);
    expect(JSON.parse(noted.stdout).importNote).toBe('cgg ignored: not in every file');
    // One complete file: nothing to say.
    const one = cli(['ingest', a, '--kit', 'one', '--device', 'n', '--tables', out, '--json']);
    expect(JSON.parse(one.stdout).importNote).toBeNull();
  });

  it('kits shows each table\'s note beside that table, not the first table\'s as the kit\'s', () => {
    const [a, b] = parts();
    const out = join(dir, 'noted');
    expect(cli(['ingest', a, '--kit', 'noted', '--device', 'n', '--tables', out, '--note', 'my n sweep']).code).toBe(0);
    expect(cli(['ingest', a, b, '--kit', 'noted', '--device', 'p', '--tables', out]).code).toBe(0);
    const r = cli(['kits', '--tables', out]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/^kit noted$/m);
    expect(r.stdout).toMatch(/^note n-tt: my n sweep$/m);
    expect(r.stdout).toMatch(/^note p-tt: cgg ignored: not in every file$/m);
  });
});
