import type { Command } from 'commander';
import { StackwrightError } from '../../errors.js';
import { probe } from '../../device/probe.js';
import { existsSync } from 'node:fs';
import { loadTable } from '../../table/store.js';
import { readTableAround } from '../../table/partial.js';
import { tablePath } from '../../table/store.js';
import { renderTable } from '../../report/text.js';
import { formatEng } from '../../units/index.js';
import { engFlag, polarityFlag, positiveFlag } from '../options.js';
import { out, tablesDirFor, toJson } from '../io.js';

interface ProbeFlags {
  kit: string;
  device: 'n' | 'p';
  corner: string;
  l: number;
  gmid?: number;
  vgs?: number;
  jd?: number;
  vds?: number;
  vsb?: number;
  w?: number;
  tables?: string;
  json?: boolean;
}

export function registerProbe(program: Command): void {
  program
    .command('probe')
    .description('every quantity of one transistor at one bias point, read from a table')
    .requiredOption('--kit <name>', 'kit name')
    .requiredOption('--device <n|p>', 'device polarity', polarityFlag)
    .option('--corner <name>', 'corner', 'tt')
    .requiredOption('--l <length>', 'channel length (may lie between table lengths), e.g. 0.5u', engFlag('--l'))
    .option('--gmid <1/V>', 'bias by gm/ID', positiveFlag('--gmid'))
    .option('--vgs <V>', 'bias by gate-source voltage (magnitude)', engFlag('--vgs'))
    .option('--jd <A/m>', 'bias by current density ID/W, e.g. 10 (A/m = µA/µm)', positiveFlag('--jd'))
    .option('--vds <V>', 'drain-source voltage magnitude (default: middle of the table vds axis)', engFlag('--vds'))
    .option('--vsb <V>', 'source-bulk voltage magnitude', engFlag('--vsb'), 0)
    .option('--w <width>', 'width for absolute currents (default: the table reference width)', positiveFlag('--w'))
    .option('--tables <dir>', 'tables folder')
    .option('--json', 'print JSON')
    .addHelpText('after', '\nExample:\n  stackwright probe --kit demo180 --device n --l 0.5u --gmid 12 --vds 0.6\n')
    .action((f: ProbeFlags) => {
      const given = (['gmid', 'vgs', 'jd'] as const).filter((k) => f[k] !== undefined);
      if (given.length !== 1) {
        throw new StackwrightError(`give exactly one of --gmid, --vgs, --jd (got ${given.length ? given.map((g) => '--' + g).join(', ') : 'none'})`, { where: 'probe' });
      }
      const dir = tablesDirFor(f.kit, f.tables);
      // One query needs the two table lengths around --l only; the whole table otherwise (and for range messages).
      const path = tablePath(dir, f.kit, f.device, f.corner);
      const table = (existsSync(path) ? readTableAround(path, f.l) : undefined) ?? loadTable(dir, f.kit, f.device, f.corner);
      const op = probe(table, { l: f.l, vgs: f.vgs, gmid: f.gmid, jd: f.jd, vds: f.vds, vsb: f.vsb, w: f.w });
      if (f.json) {
        out(toJson({ kit: f.kit, device: f.device, corner: f.corner, ...op }));
        return;
      }
      const rows: Array<[string, number, string]> = [
        ['L', op.l, 'm'], ['W', op.w, 'm'], ['VGS', op.vgs, 'V'], ['VDS', op.vds, 'V'], ['VSB', op.vsb, 'V'],
        ['ID', op.id, 'A'], ['gm', op.gm, 'S'], ['gds', op.gds, 'S'], ['gmb', op.gmb, 'S'],
        ['gm/ID', op.gmid, '1/V'], ['ID/W', op.jd, 'A/m'], ['gm/gds', op.gain, ''], ['fT', op.ft, 'Hz'],
        ['cgg', op.cgg, 'F'], ['cgs', op.cgs, 'F'], ['cgd', op.cgd, 'F'], ['cdd', op.cdd, 'F'],
      ];
      const fmt = (v: number, u: string): string =>
        Number.isNaN(v) ? 'n/a' : u === '1/V' || u === '' ? Number(v.toPrecision(4)).toString() + (u ? ' ' + u : '') : formatEng(v, u, 4);
      out(`${f.kit} ${f.device}-type, corner ${f.corner}` + (f.device === 'p' ? ' (magnitudes)' : ''));
      out(renderTable(['quantity', 'value'], rows.map(([k, v, u]) => [k, fmt(v, u)])));
    });
}
