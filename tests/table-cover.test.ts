import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { kitAccessFromTables } from '../src/solve/kit-tables.js';
import { sizeDesign } from '../src/solve/size.js';
import { parseSpec } from '../src/design/index.js';
import { loadTable } from '../src/table/index.js';
import type { DeviceTable } from '../src/table/types.js';
import { ensureDemoTables, REPO } from './helpers/cli.js';

/** The demo table cut to its VSB = 0 points, as a sweep without body bias would give. */
function vsbZeroOnly(t: DeviceTable): DeviceTable {
  const { l, vgs, vds, vsb } = t.axes;
  const n = l.length * vgs.length * vds.length;
  const data: Record<string, Float64Array> = {};
  for (const [q, arr] of Object.entries(t.data)) {
    if (!arr) continue;
    const out = new Float64Array(n);
    for (let k = 0; k < n; k++) out[k] = arr[k * vsb.length];
    data[q] = out;
  }
  return { meta: t.meta, axes: { l, vgs, vds, vsb: new Float64Array([0]) }, data: data as DeviceTable['data'] };
}

const spec = (topology: string) => parseSpec(`kit: demo180\nsupply: 1.8\nstacks:\n  - name: sink\n    device: n\n    topology: ${topology}\n    current: 10u\n    rout: 10meg\n    headroom: 0.4\n    span: 1.6\n`, 'vsb.yaml');

describe('tables with VSB = 0 only', () => {
  let kit: ReturnType<typeof kitAccessFromTables>;
  beforeAll(() => {
    ensureDemoTables();
    kit = kitAccessFromTables([vsbZeroOnly(loadTable(join(REPO, 'tables'), 'demo180', 'n', 'tt'))]);
  });

  // In a cascode the upper device's source sits at the lower device's drain, so its VSB > 0
  // (common practice; Razavi, Design of Analog CMOS Integrated Circuits, body effect in cascodes).
  for (const topology of ['cascode', 'cascode-stacked', 'triple', 'auto']) {
    it(`${topology}: says the upper devices need VSB data and which axis is missing`, () => {
      expect(() => sizeDesign(spec(topology), kit)).toThrow(
        /vsb\.yaml: stacks\[0\]\.topology: topology .* needs VSB data for its upper devices .* the table's vsb axis holds 0 V only \(kit demo180, n-type, corner tt\)/,
      );
    });
  }

  it('single still sizes: one device has its source on the rail', () => {
    const r = sizeDesign(spec('single'), kit);
    expect(r.stacks[0].devices).toHaveLength(1);
    expect(Number.isFinite(r.stacks[0].predicted.area)).toBe(true);
  });
});

describe('numbers in sizing messages carry units', () => {
  // Engineering notation with units, never raw floats such as 0.000009999999999999999 (common practice in EDA messages).
  const RAW = /\d\.\d{6,}|e-\d/;
  it('gm/ID range beyond the table, and headroom/span given to the library directly', async () => {
    const { loadKit } = await import('../src/api.js');
    const { sizeStack } = await import('../src/solve/size.js');
    const kit = loadKit('demo180', { tables: join(REPO, 'tables') });
    const base = parseSpec('kit: demo180\nsupply: 1.8\nstacks:\n  - name: s\n    device: n\n    topology: cascode\n    current: 10u\n    rout: 1meg\n    headroom: 0.3\n    span: 1.6\n    gmid: [35, 50]\n', 'g.yaml');
    let msg = '';
    try {
      sizeDesign(base, kit);
    } catch (e) {
      msg = (e as Error).message;
    }
    expect(msg).toMatch(/gm\/ID range 35 \/V\.\.50 \/V is beyond what the table reaches \(up to [\d.]+ \/V\)$/);
    expect(msg).not.toMatch(RAW);
    const stack = { ...base.stacks[0], gmid: undefined, headroom: 0.1 + 0.2 + 1.4, span: 1.6 };
    expect(() => sizeStack(stack, kit, { supply: 1.8, corners: ['tt'] })).toThrow(/headroom 1\.7 V must be below span 1\.6 V$/);
  });
});
