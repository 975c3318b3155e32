import { StackwrightError } from '../errors.js';
import type { LengthSlice } from '../device/types.js';

import { TABLE_EDGE as SLACK } from '../policy.js';
import { rangeError } from '../numeric/range-error.js';
import { formatEng } from '../units/index.js';

/** True when (vgs, vds, vsb) lies inside the slice's table. */
export function covers(slice: LengthSlice, vgs: number, vds: number, vsb: number): boolean {
  const r = slice.range;
  return (
    vgs >= r.vgs[0] - SLACK && vgs <= r.vgs[1] + SLACK &&
    vds >= r.vds[0] - SLACK && vds <= r.vds[1] + SLACK &&
    vsb >= r.vsb[0] - SLACK && vsb <= r.vsb[1] + SLACK
  );
}

/** A 'range' error naming the first axis that is outside the slice's table (the one range error, numeric/range-error). */
export function outsideSlice(slice: LengthSlice, vgs: number, vds: number, vsb: number, what: string): StackwrightError {
  const r = slice.range;
  const axes: Array<[string, number, [number, number]]> = [['vgs', vgs, r.vgs], ['vds', vds, r.vds], ['vsb', vsb, r.vsb]];
  const context = `${what} at L = ${formatEng(slice.l, 'm')}`;
  for (const [name, x, [lo, hi]] of axes) {
    if (!(x >= lo - SLACK && x <= hi + SLACK)) return rangeError(name, x, lo, hi, 'V', context);
  }
  return new StackwrightError(`${context}: the table does not cover this bias`, { kind: 'range' });
}

/** Clamp into [lo, hi]. */
export function clamp(x: number, lo: number, hi: number): number {
  return x < lo ? lo : x > hi ? hi : x;
}
