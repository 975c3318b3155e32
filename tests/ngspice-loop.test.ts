/**
 * Closed loop: ngspice (reference simulator, Debian package "ngspice")
 * characterises the invented test card, stackwright ingests the sweeps, sizes
 * cascodes from the tables, and ngspice simulates the netlists written from
 * the result. The tables and the check come from the same simulator, so what
 * is tested is the table → sizing → netlist chain, not the card.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import type { DeviceTable } from '../src/table/types.js';
import type { DesignSpec, StackSpec } from '../src/design/types.js';
import type { SizeResult, StackResult } from '../src/solve/types.js';
import { ingestTexts } from '../src/ingest/index.js';
import { sliceAt } from '../src/device/index.js';
import { stackCurve } from '../src/stack/index.js';
import { sizeDesign } from '../src/solve/index.js';
import { kitAccessFromTables } from '../src/solve/kit-tables.js';
import {
  characterise,
  measuredHeadroom,
  midSpan,
  routOf,
  interpolateCurve,
  simulateStacks,
  designNetlist,
  type CharacterisationOptions,
  type RoutPoint,
} from '../src/spice/index.js';
import { TEST_MODELS, libLine, ngspiceStatus } from './fixtures/spice/ngspice.js';
import { nCascode, pStacked } from './fixtures/spice/stacks.js';
import { stackNetlist, simulateSweep } from '../src/spice/index.js';

const KIT = 'testcard';
const SUPPLY = 1.8;

function sweepOptions(device: 'n' | 'p', corner: string): CharacterisationOptions {
  return {
    model: TEST_MODELS[device],
    device,
    lengths: [0.18e-6, 0.27e-6, 0.36e-6, 0.72e-6, 1.08e-6, 1.44e-6],
    w: 1e-6,
    vgs: { from: 0, to: 1.8, step: 0.025 },
    vds: { from: 0, to: 1.8, step: 0.05 },
    vsb: [0, 0.25, 0.5, 0.75, 1.0],
    supply: SUPPLY,
    include: libLine(corner),
  };
}

async function table(device: 'n' | 'p', corner: string): Promise<DeviceTable> {
  // Generous limit: the machine may be busy; nothing here is timed.
  const text = await characterise(sweepOptions(device, corner), { timeoutMs: 280_000 });
  return ingestTexts([{ file: `ngspice-${device}-${corner}.csv`, text }], {
    kit: KIT,
    device,
    corner,
    note: 'ngspice sweeps of the invented test card tests/fixtures/spice/test-bsim4.lib, not a real process',
  });
}

const TARGET = { current: 20e-6, rout: 20e6, headroom: 0.5, span: 1.6 };
const stacks: StackSpec[] = [
  { name: 'sink', device: 'n', topology: 'cascode', objective: 'area', ...TARGET },
  { name: 'source', device: 'p', topology: 'cascode', objective: 'area', ...TARGET },
];
const design = (corners: string[]): DesignSpec => ({ file: 'loop.yaml', kit: KIT, corners, supply: SUPPLY, stacks });

/** Predicted Rout at stack voltage v from the solver's curve (linear between its points). */
function predictedRoutAt(s: StackResult, v: number): number {
  const c = s.curve;
  let k = 0;
  while (k < c.length - 2 && c[k + 1].v < v) k++;
  const t = (v - c[k].v) / (c[k + 1].v - c[k].v);
  return c[k].rout + t * (c[k + 1].rout - c[k].rout);
}

interface Check {
  iout: number;
  rout: number;
  headroom: number;
}

async function simulate(size: SizeResult, corner: string, bias: 'ideal' | 'diodes'): Promise<Map<string, Check>> {
  const net = designNetlist(size, { supply: SUPPLY, models: TEST_MODELS, include: libLine(corner), bias, sweep: { from: 0, to: SUPPLY, step: 0.005 }, specs: stacks });
  const sims = await simulateStacks(net);
  const out = new Map<string, Check>();
  for (const sim of sims) {
    const curve: RoutPoint[] = routOf(sim.points);
    const mid = interpolateCurve(curve, midSpan(TARGET));
    out.set(sim.name, { iout: mid.iout, rout: mid.rout, headroom: measuredHeadroom(curve, TARGET) });
  }
  return out;
}

const status = ngspiceStatus();
const withNgspice = status === 'skip' ? describe.skip : describe;

describe('ngspice closed loop: presence', () => {
  it('ngspice is installed when running under CI', () => {
    expect(status).not.toBe('fail');
  });
});

withNgspice('ngspice closed loop (reference: ngspice, Debian package)', () => {
  let tables: DeviceTable[] = [];

  beforeAll(async () => {
    // One at a time: parallel runs only fight over two cores.
    for (const [d, c] of [['n', 'tt'], ['p', 'tt'], ['n', 'ss'], ['p', 'ss']] as const) tables.push(await table(d, c));
  }, 1_200_000);

  it('table-based stack curves of fixed hand-made stacks agree with ngspice', async () => {
    for (const s of [nCascode, pStacked]) {
      const t = tables.find((x) => x.meta.device === s.device && x.meta.corner === 'tt')!;
      const devices = s.devices.map((d) => ({ slice: sliceAt(t, d.l), w: d.w }));
      // Stack coordinates: p-type gates measured down from the supply.
      const gates = s.devices.map((d) => (s.device === 'n' ? d.gate : SUPPLY - d.gate));
      const table: RoutPoint[] = stackCurve(devices, gates, TARGET.span, { intervals: 320 }).map((c) => ({ v: c.v, iout: c.i, rout: c.rout }));
      const sim = routOf(await simulateSweep(stackNetlist(s, { supply: SUPPLY, models: TEST_MODELS, include: libLine('tt'), sweep: { from: 0, to: SUPPLY, step: 0.005 } })));
      for (const v of [0.8, midSpan(TARGET), 1.4]) {
        const a = interpolateCurve(table, v);
        const b = interpolateCurve(sim, v);
        expect(Math.abs(a.iout / b.iout - 1), `${s.name} iout at ${v}`).toBeLessThan(0.01);
        expect(Math.abs(a.rout / b.rout - 1), `${s.name} rout at ${v}`).toBeLessThan(0.2);
      }
      const target = { ...TARGET, rout: 0.5 * interpolateCurve(sim, midSpan(TARGET)).rout };
      expect(Math.abs(measuredHeadroom(table, target) - measuredHeadroom(sim, target)), s.name).toBeLessThan(0.05);
    }
  });

  it('sized n and p cascodes at tt meet the targets in ngspice with ideal gate sources', async () => {
    const size = sizeDesign(design(['tt']), kitAccessFromTables(tables));
    const sim = await simulate(size, 'tt', 'ideal');
    for (const s of size.stacks) {
      expect(s.feasible, `${s.name}: ${s.binding}`).toBe(true);
      const got = sim.get(s.name)!;
      const vMid = midSpan(TARGET);
      // Acceptance limits of this project's closed loop; ngspice is the reference.
      expect(Math.abs(got.iout / TARGET.current - 1), `${s.name} iout ${got.iout}`).toBeLessThan(0.05);
      expect(Math.abs(got.rout / predictedRoutAt(s, vMid) - 1), `${s.name} rout ${got.rout}`).toBeLessThan(0.2);
      expect(Math.abs(got.headroom - s.predicted.headroom), `${s.name} headroom ${got.headroom} vs ${s.predicted.headroom}`).toBeLessThan(0.05);
      expect(got.headroom).toBeLessThanOrEqual(TARGET.headroom);
      expect(got.rout).toBeGreaterThanOrEqual(TARGET.rout);
    }
  });

  it('sized for corners [tt, ss], the diode-biased stacks meet the targets in ngspice at both corners', async () => {
    const size = sizeDesign(design(['tt', 'ss']), kitAccessFromTables(tables));
    for (const corner of ['tt', 'ss']) {
      const sim = await simulate(size, corner, 'diodes');
      for (const s of size.stacks) {
        expect(s.feasible, `${s.name}: ${s.binding}`).toBe(true);
        const c = s.corners?.find((x) => x.corner === corner);
        expect(c, `${s.name} has a ${corner} corner result`).toBeDefined();
        const got = sim.get(s.name)!;
        // The diodes set the current: at every corner it should track the bias current.
        expect(Math.abs(got.iout / c!.predicted.iout - 1), `${s.name}@${corner} iout ${got.iout}`).toBeLessThan(0.05);
        expect(Math.abs(got.headroom - c!.predicted.headroom), `${s.name}@${corner} headroom ${got.headroom} vs ${c!.predicted.headroom}`).toBeLessThan(0.05);
        expect(got.headroom, `${s.name}@${corner}`).toBeLessThanOrEqual(TARGET.headroom);
        expect(got.rout, `${s.name}@${corner}`).toBeGreaterThanOrEqual(TARGET.rout);
      }
    }
  });
});
