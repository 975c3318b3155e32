import { ingestTexts } from '../src/ingest/index.js';
import { sizeDesign } from '../src/solve/index.js';
import { kitAccessFromTables } from '../src/solve/kit-tables.js';
import { characterise } from '../src/spice/index.js';
import { confirmStacks } from '../src/confirm/index.js';
import { writeFileSync, existsSync, readFileSync } from 'node:fs';
const LIB = 'tests/fixtures/spice/test-bsim4.lib';
const f = '/tmp/cf/n-tt.csv';
if (!existsSync(f)) writeFileSync(f, await characterise({ model: 'nch_test', device: 'n', lengths: [0.18e-6, 0.27e-6, 0.36e-6, 0.54e-6, 0.72e-6, 1.08e-6, 1.44e-6], w: 1e-6,
    vgs: { from: 0, to: 1.8, step: 0.025 }, vds: { from: 0, to: 1.8, step: 0.05 }, vsb: [0, 0.25, 0.5, 0.75, 1.0], supply: 1.8, include: `.lib '${process.cwd()}/${LIB}' tt` }));
const t = ingestTexts([{ file: 'n.csv', text: readFileSync(f, 'utf8') }], { kit: 'k', device: 'n', corner: 'typical' });
const kit = kitAccessFromTables([t]);
const spec = { file: 'x', kit: 'k', corners: ['typical'], supply: 1.8, stacks: [{ name: 'sink', device: 'n' as const, topology: 'cascode' as const, objective: 'area' as const, current: 20e-6, rout: 20e6, headroom: 0.5, span: 1.6 }] };
const result = sizeDesign(spec, kit);
console.log(result.stacks[0].devices.map((d) => [d.w, d.l, d.gate, d.vds]), result.stacks[0].bias.map((b) => [b.w, b.l]), result.stacks[0].predicted);
const c = await confirmStacks({ spec, result, kit, models: { n: 'nch_test', p: 'pch_test' } }, { include: LIB, sections: { typical: process.argv[2] ?? 'ss' } });
console.log(JSON.stringify(c.map((x) => ({ ...x, simulated: { ...x.simulated, curve: undefined, corners: undefined } })), null, 1));
