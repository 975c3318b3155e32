import type { Command } from 'commander';
import { kitInventory } from '../../table/index.js';
import { renderTable } from '../../report/text.js';
import { formatMicrons } from '../../report/format.js';
import { formatEng } from '../../units/index.js';
import { note, out, tablesDirFor, toJson } from '../io.js';

export function registerKits(program: Command): void {
  program
    .command('kits')
    .description('list every kit, device and corner in a tables folder, with what each table covers')
    .option('--tables <dir>', 'tables folder')
    .option('--json', 'print JSON')
    .addHelpText('after', '\nExample:\n  stackwright kits --tables tables\n')
    .action((f: { tables?: string; json?: boolean }) => {
      const dir = tablesDirFor(undefined, f.tables);
      const kits = kitInventory(dir);
      if (f.json) {
        out(toJson({ tables: dir, kits }));
        return;
      }
      if (kits.length === 0) {
        note(`no kits in ${dir}; build some with: stackwright ingest FILE.csv --kit NAME --device n`);
        return;
      }
      out(`tables: ${dir}`);
      for (const k of kits) {
        out('');
        // A note every table carries (a demo kit's label) describes the kit; other notes belong to their table.
        const first = k.tables[0]?.note;
        const shared = first !== undefined && k.tables.every((t) => t.note === first) ? first : undefined;
        out(`kit ${k.kit}${shared ? ` — ${shared}` : ''}`);
        const range = ([a, b]: [number, number]): string => `${formatEng(a, 'V')}..${formatEng(b, 'V')}`;
        out(
          renderTable(
            ['table', 'T (°C)', 'L', 'lengths', 'vgs', 'vds', 'vsb', 'derived', 'Pelgrom A_VT, A_β', 'sources'],
            k.tables.map((t) => [
              `${t.device}-${t.corner}`,
              t.temperature === undefined ? '-' : String(t.temperature),
              `${formatMicrons(t.l.min)}..${formatMicrons(t.l.max)}`,
              String(t.l.values.length),
              range(t.vgs),
              range(t.vds),
              range(t.vsb),
              Object.keys(t.derived).join(' ') || '-',
              t.mismatch ? `${(t.mismatch.avt * 1e9).toPrecision(3)} mV·µm, ${(t.mismatch.abeta * 1e8).toPrecision(3)} %·µm` : '-',
              t.sources.map((s) => `${s.file} (${s.rows} rows, sha256 ${s.sha256.slice(0, 12)})`).join('; '),
            ]),
            { align: ['left', 'right', 'left', 'right', 'left', 'left', 'left', 'left', 'left', 'left'] },
          ),
        );
        if (shared === undefined) for (const t of k.tables) if (t.note) out(`note ${t.device}-${t.corner}: ${t.note}`);
        for (const b of k.broken) out(`broken table ${b.name}: ${b.error}`);
      }
      const broken = kits.reduce((n, k) => n + k.broken.length, 0);
      if (broken > 0) note(`${broken} broken table${broken > 1 ? 's' : ''} listed above; other tables of the kit still work`);
    });
}
