import { beforeAll, describe, expect, it } from 'vitest';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { REPO, cli, ensureDemoTables } from './helpers/cli.js';
import { parseEng } from '../src/units/index.js';
import { scratchDir } from './helpers/scratch.js';

const tables = () => join(REPO, 'tables');

const stageSpec = (stage: string) => `kit: demo180\ncorner: [tt, ss]\nsupply: 1.8\nstages:\n  - name: amp\n    current: 10u\n${stage}`;

describe('gain stages through the CLI (demo180, invented demo kit)', () => {
  let dir = '';
  beforeAll(() => {
    ensureDemoTables();
    dir = scratchDir('stackwright-stage-');
  });

  it('size --json carries stages with the documented fields, SI units, one entry per load topology and one chosen', () => {
    const spec = join(dir, 'amp.yaml');
    writeFileSync(spec, stageSpec('    gain: 700\n    swing: 0.9\n    input: {device: p, topology: single}\n    load: {topology: auto}\n    gbw: 2meg\n    cap: 2p\n'));
    const r = cli(['size', spec, '--json', '--tables', tables()]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).not.toMatch(/NaN|Infinity|undefined/);
    const j = JSON.parse(r.stdout);
    expect(j.stacks).toEqual([]);
    expect(j.stages).toHaveLength(4);
    expect(j.stages.filter((s: { chosen: boolean }) => s.chosen)).toHaveLength(1);
    const s = j.stages.find((x: { chosen: boolean }) => x.chosen);
    expect(Object.keys(s)).toEqual(expect.arrayContaining(['name', 'feasible', 'chosen', 'input', 'load', 'predicted', 'curve', 'tightest']));
    expect(Object.keys(s.predicted)).toEqual(expect.arrayContaining(['gain', 'swing', 'vlow', 'vhigh', 'output', 'vin', 'gbw', 'area', 'current']));
    expect(s.input.device).toBe('p');
    expect(s.load.device).toBe('n');
    for (const d of [...s.input.devices, ...s.load.devices]) {
      expect(Object.keys(d)).toEqual(expect.arrayContaining(['role', 'w', 'l', 'gate', 'vgs', 'vds', 'vsb', 'gmid', 'id', 'gm', 'gds']));
      expect(d.l).toBeLessThan(1e-5); // metres
    }
    // The input device's gate is the input DC voltage; the current is in amperes.
    expect(s.input.devices[0].gate).toBeCloseTo(s.predicted.vin, 9);
    expect(s.predicted.current).toBeCloseTo(10e-6, 9);
    // GBW = gm_in / (2π (cap + C_out)) with C_out from the tables' drain capacitances.
    const gm = s.input.devices[0].gm;
    expect(s.predicted.gbw).toBeCloseTo(gm / (2 * Math.PI * (2e-12 + (s.predicted.cout ?? 0))), 0);
    expect(s.predicted.gbw).toBeGreaterThanOrEqual(2e6);
    expect(s.corners.map((c: { corner: string }) => c.corner)).toEqual(['tt', 'ss']);
    expect(j.stageFronts.amp.length).toBeGreaterThan(0);
  });

  it('gbw is null when not asked; text output shows both sides and the hand analysis', () => {
    const spec = join(dir, 'plain.yaml');
    writeFileSync(spec, stageSpec('    gain: 800\n    swing: 0.9\n    input: {device: n, topology: cascode}\n    load: {topology: cascode}\n'));
    const j = JSON.parse(cli(['size', spec, '--json', '--tables', tables()]).stdout);
    expect(j.stages[0].predicted.gbw).toBeNull();
    expect(j.stages[0].chosen).toBeUndefined();
    const t = cli(['size', spec, '--tables', tables()]);
    expect(t.stdout).toMatch(/stage amp: n-input cascode, p-type cascode load/);
    expect(t.stdout).toMatch(/input side/);
    expect(t.stdout).toMatch(/load side/);
    expect(t.stdout).toMatch(/supply − Σ VDSsat/);
  });

  it('an infeasible stage exits 3 and says which target binds and by how much', () => {
    const spec = join(dir, 'hard.yaml');
    writeFileSync(spec, stageSpec('    gain: 20000\n    swing: 1.5\n    input: {device: n, topology: single}\n    load: {topology: single}\n'));
    const r = cli(['size', spec, '--tables', tables()]);
    expect(r.code).toBe(3);
    expect(r.stderr).toMatch(/infeasible: amp \((corner \w+: )?(gain|swing) .* < .* \(−?-?\d/);
    const j = JSON.parse(cli(['size', spec, '--json', '--tables', tables()]).stdout);
    const b = j.stages[0].binding;
    expect(['gain', 'swing']).toContain(b.target);
    expect(b.achieved).toBeLessThan(b.required);
    expect(j.stages[0].nearest.swingAtGain).toBeLessThan(1.5);
  });

  it('a side range the tables cannot serve is one line naming the stage side\'s key, exit 2, nothing printed', () => {
    const cases: Array<[string, RegExp]> = [
      ['    gain: 100\n    swing: 0.8\n    input: {device: n, l: [5u, 9u]}\n', /^stackwright: stage "amp"\.input\.l: L range 5 µm\.\.9 µm is outside the table/],
      ['    gain: 100\n    swing: 0.8\n    input: {device: n}\n    load: {topology: cascode, gmid: [40, 50]}\n', /^stackwright: stage "amp"\.load\.gmid: gm\/ID range 40 \/V\.\.50 \/V is beyond/],
    ];
    for (const [body, message] of cases) {
      const spec = join(dir, 'range.yaml');
      writeFileSync(spec, stageSpec(body));
      const r = cli(['size', spec, '--tables', tables()]);
      expect(r.code).toBe(2);
      expect(r.stdout).toBe('');
      expect(r.stderr.trim().split('\n')).toHaveLength(1);
      // The spec has no stack: the message must not name one (it used to say stack "amp.input").
      expect(r.stderr).not.toMatch(/stack "/);
      expect(r.stderr).toMatch(message);
    }
  });

  it('netlist --stage writes the stage with the input as a DC source to sweep', () => {
    const spec = join(dir, 'plain.yaml');
    const json = join(dir, 'plain.json');
    writeFileSync(json, cli(['size', spec, '--json', '--tables', tables()]).stdout);
    const r = cli(['netlist', json, '--stage', 'amp', '--bias', 'diodes']);
    expect(r.code, r.stderr).toBe(0);
    const vin = JSON.parse(readFileSync(json, 'utf8')).stages[0].predicted.vin;
    const src = /^vin inp 0 dc (\S+)$/m.exec(r.stdout);
    expect(src).not.toBeNull();
    expect(parseEng(src![1])).toBeCloseTo(vin, 5);
    expect(r.stdout).toMatch(/^\.dc vin /m);
    expect(r.stdout).toMatch(/^m_in_bottom out|^m_in_bottom in1 inp 0 0/m);
    const bad = cli(['netlist', json, '--stage', 'nope']);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/--stage: no stage "nope"/);
  });

  it('port re-sizes a stage on the other kit with its design point and swing kept as a share of the supply', () => {
    const spec = join(dir, 'port.yaml');
    writeFileSync(spec, stageSpec('    gain: 300\n    swing: 0.9\n    input: {device: n, topology: cascode}\n    load: {topology: cascode}\n').replace('corner: [tt, ss]\n', ''));
    const r = cli(['port', spec, '--from', 'demo180', '--to', 'demo090', '--json', '--tables', tables()]);
    expect([0, 3]).toContain(r.code);
    const j = JSON.parse(r.stdout);
    // 1.8 V -> 1.2 V: output 0.9 V -> 0.6 V and swing 0.9 V -> 0.6 V (two thirds).
    expect(j.notes.join('\n')).toMatch(/amp: output 0\.9 V -> 0\.6 V, swing target 0\.9 V -> 0\.6 V/);
    expect(j.stages).toHaveLength(1);
    expect(j.stages[0].to.predicted.output).toBeCloseTo(0.6, 9);
    expect(j.stages[0].changes.some((c: { what: string }) => c.what === 'gain')).toBe(true);
    expect(j.stages[0].asIs).toBeDefined();
  });
});
