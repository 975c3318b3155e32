import { StackwrightError } from '../errors.js';
import type { LengthSlice } from '../device/types.js';

import { edgeTolerance } from '../numeric/axis.js';
import { rangeError } from '../numeric/range-error.js';
import { formatEng } from '../units/index.js';

/** True when (vgs, vds, vsb) lies inside the slice's table. */
export function covers(slice: LengthSlice, vgs: number, vds: number, vsb: number): boolean {
  // Hot path (every DC solve step, and the CLI's compiler does not inline): six comparisons, no calls.
  const e = slice.edges;
  return vgs >= e[0] && vgs <= e[1] && vds >= e[2] && vds <= e[3] && vsb >= e[4] && vsb <= e[5];
}

/** x on the axis [lo, hi] up to the table-edge tolerance (the slice's locator accepts the same). */
export function within(x: number, axis: readonly [number, number]): boolean {
  const lo = axis[0];
  const hi = axis[1];
  const slack = edgeTolerance(lo, hi);
  return x >= lo - slack && x <= hi + slack;
}

/** A 'range' error naming the first axis that is outside the slice's table (the one range error, numeric/range-error). */
export function outsideSlice(slice: LengthSlice, vgs: number, vds: number, vsb: number, what: string): StackwrightError {
  const r = slice.range;
  const axes: Array<[string, number, [number, number]]> = [['vgs', vgs, r.vgs], ['vds', vds, r.vds], ['vsb', vsb, r.vsb]];
  const context = `${what} at L = ${formatEng(slice.l, 'm')}`;
  for (const [name, x, [lo, hi]] of axes) {
    if (!within(x, [lo, hi])) return rangeError(name, x, lo, hi, 'V', context);
  }
  return new StackwrightError(`${context}: the table does not cover this bias`, { kind: 'range' });
}

/** Clamp into [lo, hi]. */
export function clamp(x: number, lo: number, hi: number): number {
  return x < lo ? lo : x > hi ? hi : x;
}
