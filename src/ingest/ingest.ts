import { readFileSync } from 'node:fs';
import { StackwrightError } from '../errors.js';
import { AXES, UNITS, type DeviceTable, type StoredQuantity, type TableMeta } from '../table/types.js';
import { checkPlainName } from '../table/validate.js';
import { showText } from '../units/index.js';
import { deriveAlong, describeDerivative } from './derive.js';
import { checkConditions } from './conditions.js';
import { checkFinite } from './finite.js';
import { buildGrid } from './grid.js';
import { checkMap } from './headers.js';
import { parseSweep } from './parse-sweep.js';
import { choosePool } from './pool.js';
import { showList } from './show.js';
import type { IngestOptions, Samples } from './types.js';

export interface SweepInput {
  file: string;
  text: string | Buffer;
}

/**
 * A table as the import made it, with what the import did besides reading (a quantity not in every file dropped,
 * points resampled) apart from the user's own note: meta.note holds both, joined, for the table file.
 */
export type IngestedTable = DeviceTable & { importNotes: string[] };

/**
 * Sweep files (.csv or gzip-compressed .csv.gz) to one DeviceTable.
 *
 * Width: with one width in the files it is the reference width. With several,
 * `width` picks the rows at that width (others are dropped, not scaled);
 * without `width` that is an error.
 */
export function ingestFiles(paths: string[], opts: IngestOptions): IngestedTable {
  return ingestLazy(
    paths.map((file) => ({
      file,
      load: () => {
        try {
          return readFileSync(file);
        } catch (e) {
          const code = (e as NodeJS.ErrnoException).code ?? (e as Error).message;
          throw new StackwrightError(`cannot read the file (${code})`, { where: file });
        }
      },
    })),
    opts,
  );
}

/** Same as ingestFiles for texts already in memory (tests, library use). */
export function ingestTexts(inputs: SweepInput[], opts: IngestOptions): IngestedTable {
  return ingestLazy(inputs.map((i) => ({ file: i.file, load: () => i.text })), opts);
}

function ingestLazy(inputs: Array<{ file: string; load: () => string | Buffer }>, opts: IngestOptions): IngestedTable {
  if (inputs.length === 0) throw new StackwrightError('no input files given');
  // The names become the table's path: refuse a bad one before a long file is read.
  checkPlainName('kit', opts.kit, '--kit');
  checkPlainName('corner', opts.corner ?? 'tt', '--corner');
  checkMap(opts.map);
  checkConditions(opts);
  let doneBefore = 0;
  const samples: Samples[] = inputs.map(({ file, load }) => {
    const progress = opts.onProgress;
    let fileLines = 0;
    const s = parseSweep(load(), file, {
      device: opts.device,
      map: opts.map,
      width: opts.width,
      // Files are read one at a time, so the total grows as later files are opened.
      onProgress: progress && ((done, total) => {
        fileLines = total;
        progress(doneBefore + done, doneBefore + total);
      }),
    });
    doneBefore += fileLines;
    return s;
  });
  checkMapUsed(opts.map, samples);
  const pool = choosePool(samples, opts.width);
  const meta = metaFor(samples, opts, pool.width);
  const files = pool.files;
  samples.length = 0; // let the per-file columns go before the grid is built
  const grid = buildGrid(pool);
  const data = grid.data;
  const derived: TableMeta['derived'] = {};
  const deriveIfMissing = (q: StoredQuantity, axis: 'vgs' | 'vds' | 'vsb', log: boolean, minPoints: number) => {
    if (data[q] || grid.axes[axis].length < minPoints) return;
    data[q] = deriveAlong(grid.axes, data.id, axis, log);
    derived[q] = describeDerivative(axis, log, grid.axes[axis].length);
  };
  deriveIfMissing('gm', 'vgs', true, 2);
  deriveIfMissing('gds', 'vds', false, 2);
  deriveIfMissing('gmb', 'vsb', true, 3);
  meta.derived = derived;
  checkFinite(grid.axes, data, new Set(Object.keys(derived)), files.length === 1 ? files[0] : `${files[0]} (+${files.length - 1} more)`);
  meta.units = Object.fromEntries([...AXES, ...(Object.keys(data) as StoredQuantity[])].map((k) => [k, UNITS[k]]));
  const importNotes = [...pool.notes, ...grid.notes].filter((s): s is string => !!s);
  const notes = [opts.note, ...importNotes].filter((s): s is string => !!s);
  if (notes.length) meta.note = notes.join('; ');
  else delete meta.note;
  return { meta, axes: grid.axes, data, importNotes };
}

function checkMapUsed(map: Record<string, string> | undefined, samples: Samples[]): void {
  const used = new Set(samples.flatMap((s) => s.mapped));
  for (const key of Object.keys(map ?? {})) {
    if (!used.has(key.trim().toLowerCase())) {
      const seen = showList(samples[0].headers);
      throw new StackwrightError(`header ${showText(key)} is in no input file (headers in ${samples[0].file}: ${seen})`, { where: '--map' });
    }
  }
}

function metaFor(samples: Samples[], opts: IngestOptions, width: number): TableMeta {
  const meta: TableMeta = {
    format: 'stackwright-table',
    version: 1,
    kit: opts.kit,
    device: opts.device,
    corner: opts.corner ?? 'tt',
    referenceWidth: width,
    sources: samples.map((s) => ({ file: s.file, sha256: s.sha256, rows: s.rows })),
    derived: {},
    units: {},
  };
  if (opts.temperature !== undefined) meta.temperature = opts.temperature;
  if (opts.mismatch) meta.mismatch = { ...opts.mismatch };
  if (opts.note !== undefined) meta.note = opts.note;
  return meta;
}
