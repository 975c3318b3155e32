import type { LengthClamp } from '../solve/table-cover.js';
import { formatEng } from '../units/index.js';

const range = ([a, b]: [number, number]): string => `${formatEng(a, 'm')}..${formatEng(b, 'm')}`;

/** One line per stack whose L range the table cut short. */
export function lengthClampNotes(clamps: readonly LengthClamp[]): string[] {
  return clamps.map(
    (c) => `${c.stack}: L range ${range(c.asked)} reaches outside the table lengths (${range(c.table)}, corner ${c.corner}); sized within ${range(c.used)}`,
  );
}
