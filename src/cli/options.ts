import { StackwrightError } from '../errors.js';
import { parseEng } from '../units/index.js';
import type { Polarity } from '../table/types.js';

/** Parse an engineering-notation flag value, naming the flag on error. */
export function engFlag(flag: string) {
  return (value: string): number => parseEng(value, flag);
}

/** A value that must be above zero (gm/ID, ID/W, a width): refused at the flag, as typed. */
export function positiveFlag(flag: string) {
  return (value: string): number => {
    const v = parseEng(value, flag);
    if (!(v > 0)) throw new StackwrightError(`expected a positive value, got "${value}"`, { where: flag });
    return v;
  };
}

export function polarityFlag(value: string): Polarity {
  if (value !== 'n' && value !== 'p') throw new StackwrightError(`expected n or p, got "${value}"`, { where: '--device' });
  return value;
}

/** Collect repeated `--map HEADER=QUANTITY`. */
export function collectMap(value: string, prev: Record<string, string> = {}): Record<string, string> {
  const eq = value.lastIndexOf('=');
  if (eq <= 0 || eq === value.length - 1) {
    throw new StackwrightError(`expected HEADER=QUANTITY, got "${value}"`, { where: '--map' });
  }
  return { ...prev, [value.slice(0, eq).trim()]: value.slice(eq + 1).trim() };
}
