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
import { ingestTexts } from '../src/ingest/index.js';
import { kitAccessFromTables } from '../src/solve/kit-tables.js';
import { sizeStage } from '../src/solve/stage-size.js';
import { characterise, measuredGain, simulateStage, stageNetlist } from '../src/spice/index.js';
import { designIndex, swingOnGrid } from '../src/stack/index.js';
import { TEST_MODELS, libLine, ngspiceStatus } from './fixtures/spice/ngspice.js';

const SUPPLY = 1.8;

async function table(device: 'n' | 'p'): Promise<DeviceTable> {
  // Generous limit: the machine may be busy; nothing here is timed.
  const text = await characterise({
    model: TEST_MODELS[device], device, lengths: [0.18e-6, 0.27e-6, 0.36e-6, 0.72e-6, 1.08e-6, 1.44e-6], w: 1e-6,
    vgs: { from: 0, to: 1.8, step: 0.025 }, vds: { from: 0, to: 1.8, step: 0.05 }, vsb: [0, 0.25, 0.5, 0.75, 1.0], supply: SUPPLY, include: libLine('tt'),
  }, { timeoutMs: 280_000 });
  return ingestTexts([{ file: `ngspice-${device}-tt.csv`, text }], {
    kit: 'testcard', device, corner: 'tt', note: 'ngspice sweeps of the invented test card tests/fixtures/spice/test-bsim4.lib, not a real process',
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
    for (const d of ['n', 'p'] as const) tables.push(await table(d));
  }, 600_000);

  for (const spec of stages) {
    it(`${spec.name} stage: gain at the design point within 20 %, swing ends within 50 mV, swing target met in simulation`, async () => {
      const r = sizeStage(spec, kitAccessFromTables(tables), { supply: SUPPLY, corners: ['tt'] }).results[0];
      expect(r.feasible, JSON.stringify(r.binding)).toBe(true);
      const vin = r.predicted.vin;
      // 2 µV steps over ±20 mV: the output crosses the whole swing within a few mV of input.
      const net = stageNetlist(r, { supply: SUPPLY, models: TEST_MODELS, include: libLine('tt'), bias: 'ideal', sweep: { from: vin - 0.02, to: vin + 0.02, step: 2e-6 } });
      const curve = measuredGain(await simulateStage(net));
      const vs = curve.map((c) => c.vout);
      const gains = curve.map((c) => c.gain);
      const j0 = designIndex(vs, spec.output);
      expect(Math.abs(vs[j0] - spec.output)).toBeLessThan(0.01);
      // Acceptance limits of this project's closed loop; ngspice is the reference.
      expect(Math.abs(gains[j0] / r.predicted.gain - 1), `gain ${gains[j0]} vs ${r.predicted.gain}`).toBeLessThan(0.2);
      const sim = swingOnGrid(vs, gains, j0, spec.gain)!;
      expect(sim).not.toBeNull();
      expect(Math.abs(sim.vlow - r.predicted.vlow!), `vlow ${sim.vlow} vs ${r.predicted.vlow}`).toBeLessThan(0.05);
      expect(Math.abs(sim.vhigh - r.predicted.vhigh!), `vhigh ${sim.vhigh} vs ${r.predicted.vhigh}`).toBeLessThan(0.05);
      expect(sim.vhigh - sim.vlow, 'simulated swing').toBeGreaterThanOrEqual(spec.swing);
      console.log(`${spec.name}: gain ngspice ${gains[j0].toFixed(1)} vs predicted ${r.predicted.gain.toFixed(1)}; swing ngspice ${sim.vlow.toFixed(4)}..${sim.vhigh.toFixed(4)} V vs predicted ${r.predicted.vlow!.toFixed(4)}..${r.predicted.vhigh!.toFixed(4)} V`);
    }, 300_000);
  }
});
