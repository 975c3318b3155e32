import { join } from 'node:path';
import type { Command } from 'commander';
import { designCurves, defaultVds } from '../../device/index.js';
import { loadTable } from '../../table/index.js';
import { designCharts } from '../../report/index.js';
import { writeFilesAtomic } from '../../fsutil.js';
import { engFlag, polarityFlag } from '../options.js';
import { note, out, tablesDirFor, toJson } from '../io.js';

interface ChartFlags {
  kit: string;
  device: 'n' | 'p';
  corner: string;
  vds?: number;
  vsb: number;
  out: string;
  tables?: string;
  force?: boolean;
  json?: boolean;
}

export function registerChart(program: Command): void {
  program
    .command('chart')
    .description('SVG design charts: gm/gds, ID/W and fT against gm/ID, one curve per length')
    .requiredOption('--kit <name>', 'kit name')
    .requiredOption('--device <n|p>', 'device polarity', polarityFlag)
    .option('--corner <name>', 'corner', 'tt')
    .option('--vds <V>', 'drain-source voltage of the curves (default: middle of the table vds axis)', engFlag('--vds'))
    .option('--vsb <V>', 'source-bulk voltage of the curves', engFlag('--vsb'), 0)
    .option('--out <dir>', 'folder for the SVG files', 'charts')
    .option('--tables <dir>', 'tables folder')
    .option('--force', 'overwrite existing chart files')
    .option('--json', 'print the curve data as JSON instead of writing charts')
    .addHelpText('after', '\nExample:\n  stackwright chart --kit demo180 --device n --vds 0.9 --out charts\n')
    .action((f: ChartFlags) => {
      const table = loadTable(tablesDirFor(f.kit, f.tables), f.kit, f.device, f.corner);
      const vds = f.vds ?? defaultVds(table);
      const curves = designCurves(table, { vds, vsb: f.vsb });
      const data = { kit: f.kit, device: f.device, corner: f.corner, vds, vsb: f.vsb, curves };
      if (f.json) {
        out(toJson(data));
        return;
      }
      const charts = designCharts(data);
      const base = `${f.kit}-${f.device}-${f.corner}`;
      const files: Array<[string, string]> = [
        [join(f.out, `${base}-gain.svg`), charts.gain],
        [join(f.out, `${base}-jd.svg`), charts.jd],
      ];
      if (charts.ft) files.push([join(f.out, `${base}-ft.svg`), charts.ft]);
      writeFilesAtomic(files, { force: f.force });
      for (const [path] of files) note(`wrote ${path}`);
    });
}
