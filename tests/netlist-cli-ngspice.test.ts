import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { cli, ensureDemoTables } from './helpers/cli.js';
import { ngspiceStatus } from './fixtures/spice/ngspice.js';

// A user's path through the tools: `size --json` on the invented reed180 kit, `netlist` of the result with the kit's
// model file, and the deck run as written by plain `ngspice -b` from another folder. ngspice is the outside check.
// Invented targets on the invented kit reed180 (same scale as demo-tables/specs/marsh-wren-spice.yaml).
const SPEC = `kit: reed180
corner: [tt, ss]
supply: 1.8
stacks:
  - {name: tail, device: n, topology: cascode, current: 40u, rout: 20meg, headroom: 0.5, span: 1.6}
  - {name: load, device: p, topology: cascode, current: 10u, rout: 50meg, headroom: 0.5, span: 1.5}
`;

let dir: string;
let resultPath: string;
let result: { stacks: Array<{ name: string; devices: Array<{ w: number }>; predicted: { iout: number } }>; corners: string[] };

beforeAll(() => {
  ensureDemoTables();
  dir = mkdtempSync(join(tmpdir(), 'sw-netlist-cli-'));
  writeFileSync(join(dir, 'spec.yaml'), SPEC);
  const r = cli(['size', join(dir, 'spec.yaml'), '--json']);
  expect(r.code, r.stderr).toBe(0);
  resultPath = join(dir, 'result.json');
  writeFileSync(resultPath, r.stdout);
  result = JSON.parse(r.stdout);
}, 120_000);

/** `ngspice -b deck` in folder `cwd`, as a designer runs a deck by hand. */
const ngspice = (deck: string, cwd: string) => spawnSync('ngspice', ['-b', deck], { cwd, encoding: 'utf8', timeout: 60_000 });

const withNgspice = ngspiceStatus() === 'skip' ? describe.skip : describe;
withNgspice('netlist of a size result, run as written by ngspice (reference simulator)', () => {
  it('a model file with library sections given by a relative path runs from another folder, at the nominal corner', () => {
    // The kit's model file has sections tt and ss (.lib NAME ... .endl): ngspice reads such a file only through
    // `.lib 'FILE' SECTION` (ngspice manual, ".lib"); `.include` of it is refused. The path must hold wherever the deck runs.
    const deck = join(dir, 'stacks.cir');
    const r = cli(['netlist', resultPath, '--include', 'demo-tables/reed180/reed180.lib', '--model-n', 'nfet_reed', '--model-p', 'pfet_reed', '--bias', 'diodes', '--out', deck]);
    expect(r.code, r.stderr).toBe(0);
    const text = readFileSync(deck, 'utf8');
    expect(text).toMatch(/^\.lib '\/.*\/demo-tables\/reed180\/reed180\.lib' tt$/m);
    const elsewhere = mkdtempSync(join(tmpdir(), 'sw-netlist-run-'));
    const run = ngspice(deck, elsewhere);
    const said = run.stdout + run.stderr;
    expect(said).not.toMatch(/error|warning/i);
    expect(run.status, said).toBe(0);
  });

  it('the deck runs by itself in batch mode: its .op at mid-span gives each stack its design current', () => {
    // Without an output statement ngspice -b runs no .dc ("no data saved", exit 1) and leaves the swept source at its
    // start, so the .op comes out at v = 0. With `.print dc` the sweep runs and the .op stays at mid-span.
    const deck = join(dir, 'stacks-ideal.cir');
    const r = cli(['netlist', resultPath, '--include', 'demo-tables/reed180/reed180.lib', '--model-n', 'nfet_reed', '--model-p', 'pfet_reed', '--out', deck]);
    expect(r.code, r.stderr).toBe(0);
    const run = ngspice(deck, dir);
    expect(run.status, run.stdout + run.stderr).toBe(0);
    expect(run.stdout + run.stderr).not.toMatch(/error|no data saved/i);
    // The .op listing prints `vm_sK#branch  value`; the tables predicted the current at mid-span within 2 %
    // (measured: 0.2 % and 0.1 %), and a .op at v = 0 would give nearly none.
    result.stacks.forEach((s, k) => {
      const m = new RegExp(`^\\s*vm_s${k + 1}#branch\\s+(\\S+)`, 'm').exec(run.stdout);
      expect(m, s.name).not.toBeNull();
      expect(Math.abs(Number(m![1]) / s.predicted.iout - 1), s.name).toBeLessThan(0.02);
    });
    // and the sweep printed its rows: one per 10 mV from 0 to the supply
    expect(run.stdout).toMatch(/^180\s+1\.800000e\+00/m);
  });

  it('a missing model file or a corner the file has no section for is one line naming --include, nothing written', () => {
    const out = join(dir, 'none.cir');
    const r = cli(['netlist', resultPath, '--include', join(dir, 'nowhere.lib'), '--out', out]);
    expect(r.code).toBe(2);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(/--include .*nowhere\.lib: model file not found/);
    expect(existsSync(out)).toBe(false);
    const lib = join(dir, 'other.lib');
    writeFileSync(lib, '* invented\n.lib ff\n.endl ff\n');
    const r2 = cli(['netlist', resultPath, '--include', lib, '--out', out]);
    expect(r2.code).toBe(2);
    expect(r2.stderr.trim().split('\n')).toHaveLength(1);
    expect(r2.stderr).toMatch(/--include .*other\.lib: .*no library section "tt".*\(has ff\)/);
    expect(existsSync(out)).toBe(false);
  });
});
