import { StackwrightError } from '../errors.js';
import { formatEng } from '../units/index.js';

// Six digits so a value just outside an edge does not print as the edge itself.
function show(x: number, unit: string): string {
  return Number.isFinite(x) ? formatEng(x, unit, 6) : `${x}${unit ? ' ' + unit : ''}`;
}

/** One-line kind 'range' error: `vds = 2.1 V is outside the table range [0 V, 1.8 V] (kit/n/tt)`. */
export function rangeError(axis: string, value: number, lo: number, hi: number, unit = '', context?: string): StackwrightError {
  const where = context ? ` (${context})` : '';
  return new StackwrightError(
    `${axis} = ${show(value, unit)} is outside the table range [${show(lo, unit)}, ${show(hi, unit)}]${where}; values are never extrapolated`,
    { kind: 'range' },
  );
}
