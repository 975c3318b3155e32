import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { parseSpec, sizeSpec, type Kit } from '../src/index.js';
import { cli, ensureDemoTables, REPO, demoKit } from './helpers/cli.js';
import { scratchDir } from './helpers/scratch.js';

/*
 * How the input is provoked outside the rails: a common-source stage on a 0.6 V supply whose
 * input device may only use gm/ID 3..6 /V. In strong inversion gm/ID = 2/Vov (square law,
 * common practice), so gm/ID ≤ 6 /V means an overdrive of at least about 0.33 V on top of a
 * threshold of a few hundred mV: |VGS| is above 0.6 V. A p-input device has its source on the
 * supply, so its gate sits at supply − VSG < 0 V; an n-input device's gate at VGS > supply.
 * Either way the gate is outside the rails, and no such bias exists in a real circuit.
 */
const stage = (device: 'n' | 'p', gmid: string) =>
  `kit: demo180\nsupply: 0.6\nstacks: []\nstages:\n  - name: amp\n    current: 10u\n    gain: 8\n    swing: 0.1\n` +
  `    input: {device: ${device}, topology: single, gmid: ${gmid}}\n    load: {topology: single}\n`;

let kit: Kit;
beforeAll(() => {
  ensureDemoTables();
  kit = demoKit('demo180');
});

describe('a stage whose input DC voltage would lie outside the rails', () => {
  for (const [device, rail, words] of [['p', 0, /input DC voltage -\d+ mV below the 0 V rail/], ['n', 0.6, /input DC voltage \d+ mV above the 600 mV supply/]] as const) {
    it(`${device}-input, gm/ID ≤ 6 /V on 0.6 V: infeasible with binding vin (rail ${rail} V), in data, text, JSON and report`, () => {
      const spec = parseSpec(stage(device, '[3, 6]'), 'rails.yaml');
      const s = sizeSpec(spec, kit).result.stages![0];
      const vin = s.predicted.vin;
      // The gate lies outside [0, supply] (the rails; common practice: an input must be biasable).
      expect(vin < 0 || vin > 0.6).toBe(true);
      // Cross-check with the input device's own VGS: a p device's gate is at supply − VSG, an n device's at VGS.
      const vgs = s.input.devices[0].vgs;
      expect(device === 'p' ? 0.6 - vgs : vgs).toBeCloseTo(vin, 6);
      // And |VGS| exceeds the supply because the overdrive alone is at least 2/(gm/ID) = 0.33 V (square law).
      expect(vgs).toBeGreaterThan(2 / 6);
      expect(s.feasible).toBe(false);
      expect(s.binding).toEqual({ target: 'vin', required: rail, achieved: vin, at: spec.stages![0].output, device: null, corner: 'tt' });
      expect(s.corners?.[0].feasible).toBe(false);
      expect(s.corners?.[0].binding?.target).toBe('vin');

      const dir = scratchDir('sw-rails-');
      const file = join(dir, 'rails.yaml');
      writeFileSync(file, stage(device, '[3, 6]'));
      const tables = join(REPO, 'tables');
      const text = cli(['size', file, '--tables', tables]);
      expect(text.code).toBe(3); // infeasible
      expect(text.stdout).toMatch(words);
      expect(cli(['size', file, '--brief', '--tables', tables]).stdout).toMatch(words);
      const json = cli(['size', file, '--json', '--tables', tables]);
      expect(json.code).toBe(3);
      const j = JSON.parse(json.stdout);
      expect(j.stages[0].binding.target).toBe('vin');
      expect(j.stages[0].binding.required).toBe(rail);
      expect(j.stages[0].binding.achieved).toBe(j.stages[0].predicted.vin);
      const report = join(dir, 'r.html');
      expect(cli(['size', file, '--report', report, '--tables', tables]).code).toBe(3);
      expect(readFileSync(report, 'utf8')).toMatch(words);
    });
  }

  for (const device of ['p', 'n'] as const) {
    it(`${device}-input with gm/ID up to 25 /V: the search avoids gates outside the rails and finds a design within them`, () => {
      // The old search picked a design with its gate outside the rails although others exist (weak inversion:
      // a lower |VGS| at a higher gm/ID).
      const spec = parseSpec(stage(device, '[3, 25]'), 'rails.yaml');
      const r = sizeSpec(spec, kit).result;
      for (const s of r.stages!) {
        if (s.input.devices.length === 0) continue;
        expect(s.predicted.vin, s.load.topology).toBeGreaterThanOrEqual(0);
        expect(s.predicted.vin, s.load.topology).toBeLessThanOrEqual(0.6);
      }
      expect(r.stages!.some((s) => s.feasible)).toBe(true);
    });
  }
});

describe('port: old stage sizes on a lower supply', () => {
  it('an as-is check whose input gate falls below ground fails with binding vin; the retargeted swing is 0.4 V, not 0.39999999999999997', async () => {
    const { stageAsIs, retargetStage } = await import('../src/solve/stage-port.js');
    // A p-input stage sized on 1.8 V has its gate near 1.8 V − VSG ≈ 0.9 V; on a 0.8 V supply the same VSG
    // puts the gate at 0.8 V − VSG < 0 (source on the supply, common practice).
    const spec = parseSpec(
      'kit: demo180\nsupply: 1.8\nstacks: []\nstages:\n  - name: amp\n    current: 10u\n    gain: 20\n    swing: 0.6\n    input: {device: p, topology: single, gmid: [4, 8]}\n    load: {topology: single}\n',
      'port.yaml',
    );
    const r = sizeSpec(spec, kit).result.stages![0];
    expect(r.feasible).toBe(true);
    const vsg = r.input.devices[0].vgs;
    expect(0.8 - vsg).toBeLessThan(0);
    const at = retargetStage(spec.stages![0], 1.8, 0.8);
    // Same share of the supply, by hand: 0.6 V · 1.2/1.8 = 0.4 V and 0.9 V · 0.8/1.8 = 0.4 V exactly (decimal arithmetic).
    expect(retargetStage(spec.stages![0], 1.8, 1.2).swing).toBe(0.4);
    expect(at.output).toBe(0.4);
    const a = stageAsIs(r, at, kit, 'tt', 0.8);
    if ('error' in a) throw new Error(a.error);
    expect(a.feasible).toBe(false);
    expect(a.binding).toMatchObject({ target: 'vin', required: 0, achieved: a.predicted.vin });
    expect(a.predicted.vin).toBeLessThan(0);
  });
});
