/**
 * Characterise the invented BSIM4 demo kit reed180 (demo-tables/reed180/reed180.lib,
 * fictional foundry, not a real process) with ngspice, through the same code as
 * `stackwright characterise`, and write its sweeps as gzip CSV beside the card:
 * values rounded to 6 significant digits (keeps the committed data small) and
 * labelled as invented. `npm install` builds the tables from these files without ngspice.
 *
 *   npx tsx scripts/reed-kit.ts [--force]
 */
import { existsSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { characterise } from '../src/spice/index.js';
import { writeFileAtomic } from '../src/fsutil.js';
import { packageRoot } from '../src/table/locate.js';
import { StackwrightError } from '../src/errors.js';
import type { Polarity } from '../src/table/types.js';

export const REED = {
  kit: 'reed180',
  card: 'reed180.lib',
  models: { n: 'nfet_reed', p: 'pfet_reed' },
  supply: 1.8,
  lengths: [0.18e-6, 0.3e-6, 0.5e-6, 0.8e-6, 1.3e-6, 2e-6],
  w: 1e-6,
  vgs: { from: 0, to: 1.8, step: 0.05 },
  vds: { from: 0, to: 1.8, step: 0.075 },
  vsb: [0, 0.3, 0.6, 0.9],
  corners: { tt: { temperature: 27 }, ss: { temperature: 100 } } as Record<string, { temperature: number }>,
} as const;

const NOTE = 'invented demonstration data: "Larkspur Microsystems" is a fictional foundry; reed180 is an invented BSIM4 card, not a real process, do not use for design; 1.8 V, 0.18 µm-class';

function round6(line: string): string {
  return line.split(',').map((x) => Number(Number(x).toPrecision(6)).toString()).join(',');
}

async function sweep(dir: string, device: Polarity, corner: string): Promise<Buffer> {
  const csv = await characterise(
    {
      model: REED.models[device], device, lengths: [...REED.lengths], w: REED.w, vgs: REED.vgs, vds: REED.vds, vsb: [...REED.vsb],
      supply: REED.supply, include: `.lib '${join(dir, REED.card)}' ${corner}`,
    },
    { timeoutMs: 30 * 60_000 },
  );
  const [header, ...rows] = csv.trimEnd().split('\n');
  const text = [
    `# INVENTED demo data: kit ${REED.kit} of the fictional foundry "Larkspur Microsystems"; not a real process`,
    `# ngspice sweep of ${REED.models[device]} in ${REED.card}, library section ${corner} (stackwright characterise), 6 significant digits`,
    header,
    ...rows.map(round6),
  ].join('\n') + '\n';
  return gzipSync(Buffer.from(text, 'utf8'), { level: 9 });
}

function kitJson(): string {
  const files: Record<string, Record<string, string>> = { n: {}, p: {} };
  for (const d of ['n', 'p']) for (const c of Object.keys(REED.corners)) files[d][c] = `${d}-${c}.csv.gz`;
  return JSON.stringify({
    kit: REED.kit, note: NOTE, foundry: 'Larkspur Microsystems (fictional)', generator: 'ngspice sweep of an invented BSIM4 card (scripts/reed-kit.ts)',
    supply: REED.supply, card: REED.card, models: REED.models, sections: Object.keys(REED.corners),
    lengths: REED.lengths, referenceWidth: REED.w, sweep: { vgs: REED.vgs, vds: REED.vds, vsb: REED.vsb },
    corners: REED.corners,
    mismatch: { n: { avt_mV_um: 5, abeta_pct_um: 1 }, p: { avt_mV_um: 4.5, abeta_pct_um: 1.2 } },
    mismatchNote: 'invented Pelgrom coefficients: sigma(dVT) = avt/sqrt(W*L), sigma(dbeta/beta) = abeta/sqrt(W*L)',
    files,
  }, null, 2) + '\n';
}

async function main(force: boolean): Promise<void> {
  const dir = join(packageRoot(), 'demo-tables', REED.kit);
  const targets = (['n', 'p'] as Polarity[]).flatMap((d) => Object.keys(REED.corners).map((c) => ({ d, c, path: join(dir, `${d}-${c}.csv.gz`) })));
  if (!force && targets.some((t) => existsSync(t.path))) throw new StackwrightError('sweeps exist; add --force to overwrite', { kind: 'exists', where: dir });
  for (const t of targets) {
    writeFileAtomic(t.path, await sweep(dir, t.d, t.c), { force: true });
    process.stderr.write(`wrote ${t.path}\n`);
  }
  writeFileSync(join(dir, 'kit.json'), kitJson());
}

if (process.argv[1] && /reed-kit\.(ts|js)$/.test(process.argv[1])) {
  main(process.argv.includes('--force')).catch((e: unknown) => {
    process.stderr.write(`${e instanceof Error ? e.message : String(e)}\n`);
    process.exit(e instanceof StackwrightError ? 2 : 1);
  });
}
