import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { kitAccessFromTables } from '../src/solve/kit-tables.js';
import { sizeDesign } from '../src/solve/size.js';
import { parseSpec } from '../src/design/index.js';
import { loadTable, writeTable } from '../src/table/index.js';
import type { DeviceTable } from '../src/table/types.js';
import { writeFileSync } from 'node:fs';
import { cli, ensureDemoTables, REPO, demoKit } from './helpers/cli.js';
import { scratchDir } from './helpers/scratch.js';

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
    const kit = demoKit('demo180');
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

describe('gain stages on tables with VSB = 0 only', () => {
  let kit: ReturnType<typeof kitAccessFromTables>;
  beforeAll(() => {
    ensureDemoTables();
    const t = (d: 'n' | 'p') => vsbZeroOnly(loadTable(join(REPO, 'tables'), 'demo180', d, 'tt'));
    kit = kitAccessFromTables([t('n'), t('p')]);
  });
  const stageSpec = (input: string, load: string) =>
    parseSpec(
      `kit: demo180\nsupply: 1.8\nstacks: []\nstages:\n  - name: amp\n    current: 10u\n    gain: 20\n    swing: 0.6\n    input: {device: n, topology: ${input}}\n    load: {topology: ${load}}\n`,
      'stage.yaml',
    );

  // An input cascode's upper device sits on the input device's drain, a cascoded load's upper devices on
  // their lower ones' drains: VSB > 0 for both (common practice; Razavi, body effect in cascodes).
  it('cascode input: one line naming the input side and the missing vsb axis', () => {
    expect(() => sizeDesign(stageSpec('cascode', 'single'), kit)).toThrow(
      /^stage\.yaml: stages\[0\]\.input\.topology: stage "amp" input side: topology cascode needs VSB data for its upper devices .* the table's vsb axis holds 0 V only \(kit demo180, n-type, corner tt\)[^\n]*$/,
    );
  });
  for (const load of ['cascode', 'triple', 'auto']) {
    it(`${load} load: one line naming the load side and the missing vsb axis`, () => {
      expect(() => sizeDesign(stageSpec('single', load), kit)).toThrow(
        new RegExp(`^stage\\.yaml: stages\\[0\\]\\.load\\.topology: stage "amp" load side: topology ${load} needs VSB data .* vsb axis holds 0 V only \\(kit demo180, p-type, corner tt\\)[^\\n]*$`),
      );
    });
  }
  it('the library entry sizeStage refuses it the same way', async () => {
    const { sizeStage } = await import('../src/solve/stage-size.js');
    expect(() => sizeStage(stageSpec('cascode', 'single').stages![0], kit, { supply: 1.8, corners: ['tt'] })).toThrow(/stage "amp" input side: topology cascode needs VSB data/);
  });
  it('single input into a single load still sizes (both sources on their rails)', () => {
    const r = sizeDesign(stageSpec('single', 'single'), kit);
    expect(r.stages?.[0].input.devices).toHaveLength(1);
    expect(Number.isFinite(r.stages?.[0].predicted.area)).toBe(true);
  });
});

describe('size on VSB = 0 tables from the command line', () => {
  it('a cascode-input stage exits 2 with one line naming the spec location, the side and the missing axis', () => {
    ensureDemoTables();
    const dir = scratchDir('sw-vsb0-');
    for (const d of ['n', 'p'] as const) writeTable(dir, vsbZeroOnly(loadTable(join(REPO, 'tables'), 'demo180', d, 'tt')));
    const spec = join(dir, 'stage.yaml');
    writeFileSync(spec, 'kit: demo180\nsupply: 1.8\nstacks: []\nstages:\n  - name: amp\n    current: 10u\n    gain: 20\n    swing: 0.6\n    input: {device: n, topology: cascode}\n    load: {topology: single}\n');
    const r = cli(['size', spec, '--tables', dir]);
    // Exit 2 for bad input, one line on stderr, nothing on stdout (the project's error convention).
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(/stage\.yaml: stages\[0\]\.input\.topology: stage "amp" input side: topology cascode needs VSB data .*vsb axis holds 0 V only/);
  });
});
