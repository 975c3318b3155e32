import { StackwrightError } from '../errors.js';

export interface WrdataTable {
  /** Column names from the header (`set wr_vecnames`); the first is the scale. */
  names: string[];
  rows: number[][];
}

/**
 * Parse ngspice `wrdata` text written with `set wr_singlescale` and
 * `set wr_vecnames`: one header line, then whitespace-separated numbers.
 */
export function parseWrdata(text: string, file = 'wrdata'): WrdataTable {
  const lines = text.split(/\r?\n/);
  const header = lines.findIndex((l) => l.trim() !== '');
  if (header < 0) throw new StackwrightError('ngspice wrote no data', { where: file });
  const names = lines[header].trim().split(/\s+/);
  const rows: number[][] = [];
  for (let i = header + 1; i < lines.length; i++) {
    const t = lines[i].trim();
    if (t === '') continue;
    const cells = t.split(/\s+/).map(Number);
    if (cells.length !== names.length || cells.some((x) => !Number.isFinite(x))) {
      throw new StackwrightError(`expected ${names.length} numbers, got "${t.slice(0, 60)}"`, { where: `${file}:${i + 1}` });
    }
    rows.push(cells);
  }
  if (rows.length === 0) throw new StackwrightError('ngspice wrote a header but no rows', { where: file });
  return { names, rows };
}
