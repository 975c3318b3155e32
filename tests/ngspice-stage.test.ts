/**
 * Closed loop for gain stages: ngspice (reference simulator, Debian package
 * "ngspice") characterises the invented test card, stackwright ingests the
 * sweeps and sizes a stage from the tables, and ngspice simulates a fine DC
 * sweep of the input voltage of the netlist written from the result, every
 * other gate fixed. The gain is |dvout/dvin| of that sweep.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import type { DeviceTable } from '../src/table/types.js';
import type { StageSpec } from '../src/design/types.js';
import type { StagePredicted, StageResult } from '../src/solve/stage-types.js';
import { ingestTexts } from '../src/ingest/index.js';
import { kitAccessFromTables } from '../src/solve/kit-tables.js';
import { sizeStage } from '../src/solve/stage-size.js';
import { characterise, measuredGain, simulateStage, stageNetlist } from '../src/spice/index.js';
import { designIndex, swingOnGrid } from '../src/stack/index.js';
import { TEST_MODELS, libLine, ngspiceStatus } from './fixtures/spice/ngspice.js';

const SUPPLY = 1.8;

async function table(device: 'n' | 'p', corner: string): Promise<DeviceTable> {
  // Generous limit: the machine may be busy; nothing here is timed.
  const text = await characterise({
    model: TEST_MODELS[device], device, lengths: [0.18e-6, 0.27e-6, 0.36e-6, 0.72e-6, 1.08e-6, 1.44e-6], w: 1e-6,
    vgs: { from: 0, to: 1.8, step: 0.025 }, vds: { from: 0, to: 1.8, step: 0.05 }, vsb: [0, 0.25, 0.5, 0.75, 1.0], supply: SUPPLY, include: libLine(corner),
  }, { timeoutMs: 280_000 });
  return ingestTexts([{ file: `ngspice-${device}-${corner}.csv`, text }], {
    kit: 'testcard', device, corner, note: 'ngspice sweeps of the invented test card tests/fixtures/spice/test-bsim4.lib, not a real process',
  });
}

const stages: StageSpec[] = [
  { name: 'n-input', current: 20e-6, gain: 300, swing: 0.9, output: 0.9, input: { device: 'n', topology: 'cascode' }, load: { topology: 'cascode' }, objective: 'area' },
  { name: 'p-input', current: 20e-6, gain: 200, swing: 0.8, output: 0.8, input: { device: 'p', topology: 'single' }, load: { topology: 'cascode' }, objective: 'area' },
];

const status = ngspiceStatus();
const withNgspice = status === 'skip' ? describe.skip : describe;

withNgspice('ngspice closed loop for gain stages (reference: ngspice, Debian package)', () => {
  let tables: DeviceTable[] = [];

  beforeAll(async () => {
    // One at a time: parallel runs only fight over two cores.
    for (const [d, c] of [['n', 'tt'], ['p', 'tt'], ['n', 'ss'], ['p', 'ss']] as const) tables.push(await table(d, c));
  }, 600_000);

  /** Simulate a stage's input sweep at a corner; the gain curve against vout and the index of the design point. */
  async function simulated(r: StageResult, corner: string, bias: 'ideal' | 'diodes', vin: number, output: number) {
    // 2 µV steps over ±30 mV: the output crosses the whole swing within a few mV of input.
    const net = stageNetlist(r, { supply: SUPPLY, models: TEST_MODELS, include: libLine(corner), bias, sweep: { from: vin - 0.03, to: vin + 0.03, step: 2e-6 } });
    const curve = measuredGain(await simulateStage(net));
    const vs = curve.map((c) => c.vout);
    const gains = curve.map((c) => c.gain);
    const j0 = designIndex(vs, output);
    return { vs, gains, j0 };
  }

  /** Acceptance limits of this project's closed loop; ngspice is the reference. */
  function check(spec: StageSpec, p: StagePredicted, sim: { vs: number[]; gains: number[]; j0: number }, what: string): void {
    const { vs, gains, j0 } = sim;
    expect(Math.abs(vs[j0] - spec.output), `${what}: the sweep reaches the design point`).toBeLessThan(0.01);
    expect(Math.abs(gains[j0] / p.gain - 1), `${what}: gain ${gains[j0]} vs ${p.gain}`).toBeLessThan(0.2);
    const s = swingOnGrid(vs, gains, j0, spec.gain)!;
    expect(s, `${what}: simulated swing`).not.toBeNull();
    expect(Math.abs(s.vlow - p.vlow!), `${what}: vlow ${s.vlow} vs ${p.vlow}`).toBeLessThan(0.05);
    expect(Math.abs(s.vhigh - p.vhigh!), `${what}: vhigh ${s.vhigh} vs ${p.vhigh}`).toBeLessThan(0.05);
    expect(s.vhigh - s.vlow, `${what}: simulated swing meets the target`).toBeGreaterThanOrEqual(spec.swing);
    console.log(`${what}: gain ngspice ${gains[j0].toFixed(1)} vs predicted ${p.gain.toFixed(1)}; swing ngspice ${s.vlow.toFixed(4)}..${s.vhigh.toFixed(4)} V vs predicted ${p.vlow!.toFixed(4)}..${p.vhigh!.toFixed(4)} V`);
  }

  for (const spec of stages) {
    it(`${spec.name} stage: gain at the design point within 20 %, swing ends within 50 mV, swing target met in simulation`, async () => {
      const tt = tables.filter((t) => t.meta.corner === 'tt');
      const r = sizeStage(spec, kitAccessFromTables(tt), { supply: SUPPLY, corners: ['tt'] }).results[0];
      expect(r.feasible, JSON.stringify(r.binding)).toBe(true);
      check(spec, r.predicted, await simulated(r, 'tt', 'ideal', r.predicted.vin, spec.output), spec.name);
    }, 300_000);
  }

  it('sized for corners [tt, ss], the diode-biased n-input stage meets gain and swing in ngspice at both corners', async () => {
    const spec = stages[0];
    const r = sizeStage(spec, kitAccessFromTables(tables), { supply: SUPPLY, corners: ['tt', 'ss'] }).results[0];
    expect(r.feasible, JSON.stringify(r.binding)).toBe(true);
    for (const c of r.corners!) {
      // The bias diodes set every fixed gate at each corner; the input DC voltage is the one predicted there.
      check(spec, c.predicted, await simulated(r, c.corner, 'diodes', c.predicted.vin, spec.output), `${spec.name}@${c.corner} (diodes)`);
    }
  }, 600_000);
});
