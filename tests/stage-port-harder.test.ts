import { beforeAll, describe, expect, it } from 'vitest';
import { parseSpec, portSpec, type Kit } from '../src/index.js';
import { harderStage } from '../src/solve/stage-port.js';
import { stageHarderText } from '../src/report/port-harder.js';
import { renderPortText } from '../src/report/port-text.js';
import type { StageResult } from '../src/solve/stage-types.js';
import { toJson } from '../src/cli/io.js';
import { demoKits } from './helpers/cli.js';

// The demo spec's gain stage (demo-tables/specs/marsh-wren.yaml), alone.
const spec = parseSpec(
  'kit: demo180\nsupply: 1.8\nstages:\n' +
    '  - {name: ota-gain, current: 10u, gain: 1500, swing: 1.0, output: 0.9, input: {device: n, topology: cascode}, load: {topology: auto}, objective: area}\n',
  'stage.yaml',
);
const stageSpec = spec.stages![0];

const stage = (predicted: Partial<StageResult['predicted']>, more: Partial<StageResult> = {}): StageResult =>
  ({
    name: 'ota-gain', feasible: true,
    input: { device: 'n', topology: 'cascode', devices: [], bias: [] },
    load: { device: 'p', topology: 'cascode', devices: [], bias: [] },
    predicted: { gain: 3000, swing: 1.05, vlow: 0.35, vhigh: 1.4, output: 0.9, vin: 0.5, gbw: null, cout: null, area: 1e-11, current: 1e-5, ...predicted },
    ...more,
  }) as StageResult;

describe('port: what got harder for a gain stage (data, then words)', () => {
  // Margin = predicted/required and slack = achieved − required: the usual way to state how far a target is met
  // (common practice). Thresholds: the stage search's own tolerance (README: 5 % in gain, 10 mV in swing).
  it('a gain margin that fell by more than 5 % is harder; a smaller drop is not', () => {
    const from = stage({ gain: 3000 });
    const item = harderStage(stageSpec, stageSpec, from, stage({ gain: 2250 })).find((h) => h.quantity === 'gain');
    expect(item).toEqual({ quantity: 'gain', required: 1500, from: 3000, to: 2250, fromMargin: 2, toMargin: 1.5 });
    expect(stageHarderText(item!, false)).toBe('gain: margin 2.00x -> 1.50x of the target');
    expect(harderStage(stageSpec, stageSpec, from, stage({ gain: 2900 })).find((h) => h.quantity === 'gain')).toBeUndefined();
  });

  it('swing slack is taken against each kit\'s own target (port rescales it with the supply)', () => {
    const smaller = { ...stageSpec, swing: 0.667 };
    // 1.05 − 1.0 = 50 mV of slack before; 0.68 − 0.667 = 13 mV after.
    const item = harderStage(stageSpec, smaller, stage({ swing: 1.05 }), stage({ swing: 0.68 })).find((h) => h.quantity === 'swing');
    expect(item?.quantity).toBe('swing');
    if (item?.quantity !== 'swing') return;
    expect(item.fromSlack).toBeCloseTo(0.05, 12);
    expect(item.toSlack).toBeCloseTo(0.013, 12);
    expect(stageHarderText(item, false)).toBe('swing: slack 50 mV -> 13 mV');
    // The same swing against the same smaller share: 1.05 − 1.0 and 0.717 − 0.667 are both 50 mV, nothing harder.
    expect(harderStage(stageSpec, smaller, stage({ swing: 1.05 }), stage({ swing: 0.717 })).some((h) => h.quantity === 'swing')).toBe(false);
  });

  it('an infeasible new design carries its binding verdict; a load topology change and area growth are listed', () => {
    const binding = { target: 'swing' as const, required: 1, achieved: 0.9, at: null, device: null, corner: 'tt' };
    const to = stage({ area: 2.5e-11, swing: 0.9 }, { feasible: false, binding, load: { device: 'p', topology: 'triple', devices: [], bias: [] } });
    const list = harderStage(stageSpec, stageSpec, stage({}), to);
    expect(list.map((h) => h.quantity)).toEqual(['feasible', 'swing', 'area', 'topology']);
    expect(list[0]).toEqual({ quantity: 'feasible', from: true, to: false, binding });
    expect(list[2]).toMatchObject({ quantity: 'area', from: 1e-11, to: 2.5e-11 });
    expect(list[2].quantity === 'area' && list[2].ratio).toBeCloseTo(2.5, 12);
    expect(stageHarderText(list[3], false)).toBe('load topology: cascode -> triple');
    expect(stageHarderText(list[0], false)).toMatch(/^infeasible on the new kit: swing at the gain target 900 mV < 1 V/);
  });

  describe('end to end: the demo stage ported from demo180 to demo090', () => {
    let kits: Record<'demo180' | 'demo090', Kit>;
    beforeAll(() => {
      ({ kits } = demoKits());
    });

    it('lists the area growth the side-by-side table shows, in JSON and in the text', () => {
      const run = portSpec(spec, kits.demo180, kits.demo090);
      const s = run.stages[0];
      const ratio = s.to.predicted.area / s.from.predicted.area;
      const area = s.harder.find((h) => h.quantity === 'area');
      // On the demo kits the stage comes out several times larger on demo090 (its supply is lower, so the load
      // spends more width on Rout); the harder list and the compare table are read from the same two designs.
      expect(ratio).toBeGreaterThan(1.2);
      expect(area).toEqual({ quantity: 'area', from: s.from.predicted.area, to: s.to.predicted.area, ratio });
      const json = JSON.parse(toJson(run));
      expect(json.stages[0].harder).toEqual(JSON.parse(JSON.stringify(s.harder)));
      const text = renderPortText(run, { color: false });
      const line = text.split('\n').filter((l) => l.startsWith('  harder on demo090: '));
      expect(line).toHaveLength(1);
      expect(line[0]).not.toMatch(/NaN|Infinity|undefined/);
      expect(line[0]).toContain(`area: ${ratio.toFixed(2)}x larger`);
    });
  });
});
