import { StackwrightError } from '../errors.js';
import { parseEng, showText } from '../units/index.js';

/**
 * A cell to a finite number: plain `Number` first (the common case, fast),
 * then SPICE scale suffixes (`0.18u`), then a decimal comma when the file is
 * semicolon-separated. Returns NaN when none applies; the caller reports where.
 */
export function readCell(cell: string, decimalComma: boolean): number {
  const v = +cell;
  if (v - v === 0 && (v !== 0 || /\d/.test(cell)) && !radixLiteral(v, cell)) return v;
  return slowCell(cell, decimalComma);
}

/**
 * `+cell` also reads JavaScript's 0x10, 0o7 and 0b1 (integers, so only those are looked at): not decimal
 * numbers, and not what SPICE reads either, so they go to the reader that refuses them.
 */
export function radixLiteral(v: number, cell: string): boolean {
  return Number.isInteger(v) && /[xob]/i.test(cell);
}

function slowCell(cell: string, decimalComma: boolean): number {
  const t = cell.trim();
  if (t === '') return NaN;
  const text = decimalComma && /^[+-]?\d*,\d/.test(t) ? t.replace(',', '.') : t;
  try {
    return parseEng(text);
  } catch {
    return NaN;
  }
}

export function badCell(cell: string, header: string, where: string): StackwrightError {
  const t = cell.trim();
  if (t === '') return new StackwrightError(`column ${showText(header)}: empty cell, expected a number`, { where });
  let why = `${showText(t)} is not a finite number`;
  try {
    parseEng(t);
  } catch (e) {
    if (/ambiguous/.test((e as Error).message)) why = (e as Error).message;
  }
  return new StackwrightError(`column ${showText(header)}: ${why}`, { where });
}
