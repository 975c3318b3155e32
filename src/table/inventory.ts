import { join } from 'node:path';
import { StackwrightError } from '../errors.js';
import { listKits, listTables, readTableHeader, TABLE_EXT } from './store.js';
import type { MismatchCoefficients, Polarity, SourceFile, StoredQuantity } from './types.js';

export interface TableSummary {
  device: Polarity;
  corner: string;
  file: string;
  temperature?: number;
  referenceWidth: number;
  l: { min: number; max: number; values: number[] };
  vgs: [number, number];
  vds: [number, number];
  vsb: [number, number];
  /** Quantities with a data block. */
  stored: StoredQuantity[];
  /** Stored quantities not read from a column, with how they were derived. */
  derived: Partial<Record<StoredQuantity, string>>;
  sources: SourceFile[];
  note?: string;
  mismatch?: MismatchCoefficients;
  /** Grid points per quantity. */
  points: number;
}

/** A table file whose header cannot be read, with why. */
export interface BrokenTable {
  /** `<device>-<corner>` from the file name. */
  name: string;
  file: string;
  error: string;
}

export interface KitSummary {
  kit: string;
  tables: TableSummary[];
  /** Files that look like tables of this kit but cannot be read; listed, not fatal. */
  broken: BrokenTable[];
}

/** What every kit in a table folder holds, read from the headers only. */
export function kitInventory(dir: string): KitSummary[] {
  return listKits(dir).map((kit) => {
    const tables: TableSummary[] = [];
    const broken: BrokenTable[] = [];
    for (const name of listTables(dir, kit)) {
      const file = join(dir, kit, name + TABLE_EXT);
      try {
        tables.push(summarise(file));
      } catch (e) {
        if (!(e instanceof StackwrightError)) throw e;
        broken.push({ name, file, error: e.message });
      }
    }
    return { kit, tables, broken };
  });
}

function summarise(file: string): TableSummary {
  const { meta, axes, layout } = readTableHeader(file);
  const span = (a: number[]): [number, number] => [a[0], a[a.length - 1]];
  const summary: TableSummary = {
    device: meta.device,
    corner: meta.corner,
    file,
    referenceWidth: meta.referenceWidth,
    l: { min: axes.l[0], max: axes.l[axes.l.length - 1], values: axes.l },
    vgs: span(axes.vgs),
    vds: span(axes.vds),
    vsb: span(axes.vsb),
    stored: Object.keys(layout) as StoredQuantity[],
    derived: meta.derived,
    sources: meta.sources,
    points: axes.l.length * axes.vgs.length * axes.vds.length * axes.vsb.length,
  };
  if (meta.temperature !== undefined) summary.temperature = meta.temperature;
  if (meta.note !== undefined) summary.note = meta.note;
  if (meta.mismatch !== undefined) summary.mismatch = meta.mismatch;
  return summary;
}
