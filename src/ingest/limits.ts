import { StackwrightError } from '../errors.js';
import { showText, showValue } from '../units/index.js';
import type { Quantity } from './types.js';
import { dimensionOf } from './units.js';

/**
 * Largest magnitude (SI) accepted per dimension. Far outside anything a MOSFET
 * sweep holds, yet small enough that later arithmetic (1 nV snapping, ln id,
 * slopes) stays finite; a value beyond is a units or export mistake, not data.
 */
const LIMIT: Record<ReturnType<typeof dimensionOf>, { max: number; text: string }> = {
  length: { max: 1, text: 'above 0 and at most 1 m' },
  voltage: { max: 1e3, text: 'at most 1000 V in magnitude' },
  current: { max: 1e3, text: 'at most 1000 A in magnitude' },
  conductance: { max: 1e3, text: 'at most 1000 S in magnitude' },
  capacitance: { max: 1, text: 'at most 1 F in magnitude' },
};

const UNIT: Record<ReturnType<typeof dimensionOf>, string> = { length: 'm', voltage: 'V', current: 'A', conductance: 'S', capacitance: 'F' };

export function limitOf(q: Quantity): number {
  return LIMIT[dimensionOf(q)].max;
}

export function outOfRange(cell: string, header: string, q: Quantity, value: number, where: string): StackwrightError {
  const lim = LIMIT[dimensionOf(q)];
  return new StackwrightError(
    `column ${showText(header)}: ${showText(cell.trim())} (${showValue(value, UNIT[dimensionOf(q)])}) is outside the accepted range for ${q}: ${lim.text}` +
      // A size above 1 m is a column in um or nm, as the plausibility check says of smaller ones.
      (dimensionOf(q) === 'length' && value > 0 ? '; check the unit in the header or name one with --map' : ''),
    { where },
  );
}
