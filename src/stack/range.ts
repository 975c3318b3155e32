import { StackwrightError } from '../errors.js';
import type { LengthSlice } from '../device/types.js';

import { TABLE_EDGE as SLACK } from '../policy.js';

/** True when (vgs, vds, vsb) lies inside the slice's table. */
export function covers(slice: LengthSlice, vgs: number, vds: number, vsb: number): boolean {
  const r = slice.range;
  return (
    vgs >= r.vgs[0] - SLACK && vgs <= r.vgs[1] + SLACK &&
    vds >= r.vds[0] - SLACK && vds <= r.vds[1] + SLACK &&
    vsb >= r.vsb[0] - SLACK && vsb <= r.vsb[1] + SLACK
  );
}

/** A 'range' error naming the first axis that is outside the table. */
export function rangeError(slice: LengthSlice, vgs: number, vds: number, vsb: number, what: string): StackwrightError {
  const r = slice.range;
  const axes: Array<[string, number, [number, number]]> = [['vgs', vgs, r.vgs], ['vds', vds, r.vds], ['vsb', vsb, r.vsb]];
  for (const [name, x, [lo, hi]] of axes) {
    if (!(x >= lo - SLACK && x <= hi + SLACK)) {
      return new StackwrightError(
        `${what}: ${name} = ${x.toFixed(4)} V is outside the table (${lo}..${hi} V) at L = ${(slice.l * 1e6).toPrecision(4)} µm`,
        { kind: 'range' },
      );
    }
  }
  return new StackwrightError(`${what}: the table does not cover this bias`, { kind: 'range' });
}

/** Clamp into [lo, hi]. */
export function clamp(x: number, lo: number, hi: number): number {
  return x < lo ? lo : x > hi ? hi : x;
}
