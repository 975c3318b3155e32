import { StackwrightError } from '../errors.js';
import { CHAR_COLUMNS, DEFAULT_DATA_FILE, type CharacterisationOptions } from './characterise.js';
import { parseWrdata } from './wrdata.js';

/**
 * The data file of a characterisation run (what the deck writes, readable by
 * `ingest` as it is) as comma-separated long-format CSV with header
 * CHAR_COLUMNS: the sweep scale column is dropped, numbers keep 10 digits.
 */
export function characterisationCsv(files: Record<string, string>, opts: Pick<CharacterisationOptions, 'dataFile'>): string {
  const name = opts.dataFile ?? DEFAULT_DATA_FILE;
  const text = files[name];
  if (text === undefined) throw new StackwrightError('ngspice did not write this file', { where: name });
  const table = parseWrdata(text, name);
  const at = CHAR_COLUMNS.map((c) => table.names.indexOf(c));
  const missing = CHAR_COLUMNS.filter((_, i) => at[i] < 0);
  if (missing.length) throw new StackwrightError(`missing columns ${missing.join(', ')}`, { where: name });
  const out: string[] = [CHAR_COLUMNS.join(',')];
  for (const row of table.rows) out.push(at.map((j) => fmt(row[j])).join(','));
  return out.join('\n') + '\n';
}

function fmt(x: number): string {
  const r = Number(x.toPrecision(10));
  return Object.is(r, -0) ? '0' : r.toString();
}
