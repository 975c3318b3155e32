/**
 * Characterise a SPICE model with ngspice into a long-format CSV that
 * `ingest` reads. Default: the invented test card in tests/fixtures/spice.
 *
 *   npx tsx scripts/ngspice-characterise.ts n tt out.csv [lib-file] [model] [--force]
 */
import { existsSync } from 'node:fs';
import { writeFile, rename } from 'node:fs/promises';
import { resolve } from 'node:path';
import { characterise } from '../src/spice/index.js';
import { StackwrightError } from '../src/errors.js';

async function main(all: string[]): Promise<void> {
  const force = all.includes('--force');
  const argv = all.filter((a) => a !== '--force');
  const [device, corner = 'tt', out, lib = 'tests/fixtures/spice/test-bsim4.lib', model] = argv;
  if ((device !== 'n' && device !== 'p') || !out) {
    throw new StackwrightError('usage: ngspice-characterise.ts n|p corner out.csv [lib-file] [model]', { where: 'arguments' });
  }
  if (existsSync(out) && !force) throw new StackwrightError('file exists; add --force to overwrite', { kind: 'exists', where: out });
  const csv = await characterise({
    model: model ?? (device === 'n' ? 'nch_test' : 'pch_test'),
    device,
    lengths: [0.18e-6, 0.27e-6, 0.36e-6, 0.54e-6, 0.72e-6, 1.08e-6, 1.44e-6],
    w: 1e-6,
    vgs: { from: 0, to: 1.8, step: 0.025 },
    vds: { from: 0, to: 1.8, step: 0.05 },
    vsb: [0, 0.2, 0.4, 0.6, 0.8, 1.0],
    supply: 1.8,
    include: `.lib '${resolve(lib)}' ${corner}`,
  });
  const tmp = `${out}.tmp-${process.pid}`;
  await writeFile(tmp, csv);
  await rename(tmp, out);
  console.log(`wrote ${out} (${csv.split('\n').length - 2} rows)`);
}

main(process.argv.slice(2)).catch((e: unknown) => {
  console.error(e instanceof Error ? e.message : String(e));
  process.exit(e instanceof StackwrightError ? 2 : 1);
});
