/**
 * Build the tables of the invented demo kits (demo-tables/<kit>/*.csv.gz) into
 * tables/<kit>/, skipping tables whose source files are unchanged. Run by
 * `npm install` (prepare) and `npm run demo`.
 */
import { createHash } from 'node:crypto';
import { existsSync, readFileSync, readdirSync } from 'node:fs';
import { join, relative } from 'node:path';
import { ingestFiles } from '../src/ingest/index.js';
import { readTableHeader, tablePath, writeTable } from '../src/table/index.js';
import { packageRoot } from '../src/table/locate.js';
import type { Polarity } from '../src/table/types.js';

interface KitJson {
  kit: string;
  note: string;
  corners: Record<string, { temperature: number }>;
  mismatch: Record<Polarity, { avt_mV_um: number; abeta_pct_um: number }>;
  files: Record<Polarity, Record<string, string>>;
}

export function buildDemoTables(root = packageRoot(), outDir = join(root, 'tables'), log: (s: string) => void = (s) => { process.stderr.write(s + '\n'); }): number {
  const src = join(root, 'demo-tables');
  let built = 0;
  for (const kitName of readdirSync(src).sort()) {
    const kitFile = join(src, kitName, 'kit.json');
    if (!existsSync(kitFile)) continue;
    const kit = JSON.parse(readFileSync(kitFile, 'utf8')) as KitJson;
    for (const device of ['n', 'p'] as Polarity[]) {
      for (const [corner, file] of Object.entries(kit.files[device])) {
        const csv = join(src, kitName, file);
        const rel = relative(root, csv);
        const target = tablePath(outDir, kit.kit, device, corner);
        const sha = createHash('sha256').update(readFileSync(csv)).digest('hex');
        if (existsSync(target)) {
          try {
            if (readTableHeader(target).meta.sources[0]?.sha256 === sha) continue;
          } catch {
            // unreadable: rebuild it
          }
        }
        const m = kit.mismatch[device];
        const table = ingestFiles([csv], {
          kit: kit.kit,
          device,
          corner,
          temperature: kit.corners[corner]?.temperature,
          note: kit.note,
          // mV·µm -> V·m, %·µm -> fraction·m
          mismatch: { avt: m.avt_mV_um * 1e-9, abeta: m.abeta_pct_um * 1e-8 },
        });
        table.meta.sources = table.meta.sources.map((s) => ({ ...s, file: rel }));
        writeTable(outDir, table, { force: true });
        built++;
      }
    }
  }
  log(built ? `demo tables: built ${built} table(s) in ${relative(process.cwd(), outDir) || outDir}` : 'demo tables: up to date');
  return built;
}

if (process.argv[1] && /build-demo-tables\.(ts|js)$/.test(process.argv[1])) buildDemoTables();
