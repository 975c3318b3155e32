import type { Command } from 'commander';
import { StackwrightError } from '../../errors.js';
import { ingestFiles, QUANTITIES } from '../../ingest/index.js';
import { writeTable } from '../../table/index.js';
import { formatEng } from '../../units/index.js';
import { collectMap, engFlag, polarityFlag } from '../options.js';
import { note, out, toJson } from '../io.js';
import { progressBar } from '../progress.js';

interface IngestFlags {
  kit: string;
  device: 'n' | 'p';
  corner: string;
  width?: number;
  map?: Record<string, string>;
  tables: string;
  temperature?: number;
  avt?: number;
  abeta?: number;
  note?: string;
  force?: boolean;
  json?: boolean;
}

export function registerIngest(program: Command): void {
  program
    .command('ingest')
    .description('import characterisation sweeps (long-format CSV, .csv.gz) into a table')
    .argument('<csv...>', 'CSV files, one row per bias point')
    .requiredOption('--kit <name>', 'kit name to file the table under')
    .requiredOption('--device <n|p>', 'device polarity', polarityFlag)
    .option('--corner <name>', 'corner name', 'tt')
    .option('--width <W>', 'device width when the CSV has no w column, or the width to keep when it has several', engFlag('--width'))
    .option('--map <HEADER=QUANTITY>', `name a column: quantity one of ${QUANTITIES.join(', ')}, or skip to leave it out (repeatable)`, collectMap)
    .option('--tables <dir>', 'tables folder to write into', 'tables')
    .option('--temperature <°C>', 'temperature of this corner', engFlag('--temperature'))
    .option('--avt <mV·µm>', 'Pelgrom threshold mismatch coefficient A_VT, in mV·µm', engFlag('--avt'))
    .option('--abeta <%·µm>', 'Pelgrom current-factor mismatch coefficient A_β, in %·µm', engFlag('--abeta'))
    .option('--note <text>', 'free text stored with the table')
    .option('--force', 'overwrite an existing table')
    .option('--json', 'print a JSON summary')
    .addHelpText('after', '\nExample:\n  stackwright ingest sweeps/nfet_tt.csv --kit mykit --device n --corner tt --map "I(Vd)=id"\n')
    .action((files: string[], f: IngestFlags) => {
      if ((f.avt === undefined) !== (f.abeta === undefined)) {
        throw new StackwrightError('give both --avt and --abeta, or neither', { where: f.avt === undefined ? '--avt' : '--abeta' });
      }
      const bar = progressBar(`ingest ${f.kit} ${f.device}-${f.corner}`);
      const table = ingestFiles(files, {
        kit: f.kit,
        device: f.device,
        corner: f.corner,
        width: f.width,
        map: f.map,
        temperature: f.temperature,
        note: f.note,
        // mV·µm -> V·m and %·µm -> fraction·m
        mismatch: f.avt === undefined ? undefined : { avt: f.avt * 1e-9, abeta: (f.abeta as number) * 1e-8 },
        onProgress: bar.update,
      });
      bar.done();
      const path = writeTable(f.tables, table, { force: f.force });
      const { axes, meta } = table;
      const summary = {
        path,
        kit: meta.kit,
        device: meta.device,
        corner: meta.corner,
        rows: meta.sources.reduce((s, x) => s + x.rows, 0),
        lengths: Array.from(axes.l),
        vgs: [axes.vgs[0], axes.vgs[axes.vgs.length - 1], axes.vgs.length],
        vds: [axes.vds[0], axes.vds[axes.vds.length - 1], axes.vds.length],
        vsb: [axes.vsb[0], axes.vsb[axes.vsb.length - 1], axes.vsb.length],
        derived: meta.derived,
        // What the import did beyond reading (columns dropped, points resampled), apart from the user's own --note.
        importNote: table.importNotes.length ? table.importNotes.join('; ') : null,
      };
      if (f.json) {
        out(toJson(summary));
        return;
      }
      note(
        `wrote ${path}: ${summary.rows} rows -> ${axes.l.length} lengths ` +
          `(${formatEng(axes.l[0], 'm')}..${formatEng(axes.l[axes.l.length - 1], 'm')}) x ` +
          `${axes.vgs.length} vgs x ${axes.vds.length} vds x ${axes.vsb.length} vsb` +
          (Object.keys(meta.derived).length ? `; derived: ${Object.keys(meta.derived).join(', ')}` : ''),
      );
      if (summary.importNote !== null) note(`note: ${summary.importNote}`);
    });
}

