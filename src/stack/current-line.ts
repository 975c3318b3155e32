import type { LengthSlice } from '../device/types.js';
import type { FallingSloped } from '../numeric/safe-newton.js';
import { covers } from './range.js';

const s4 = new Float64Array(4);
// The bias of the lookup, [vgs, vds, vsb] (LengthSlice.jdSlopes takes it in an array).
const at3 = new Float64Array(3);

/**
 * A device's current w·jd along a straight line in bias space, (VGS, VDS, VSB) = base + x·dir, held against a
 * current `i`, as a falling function of x for the root searches (numeric/illinois, numeric/safe-newton). `excess`:
 * the current over i (for a line along which the current falls), else i over the current (along which it rises).
 * `log`: as the log of that ratio — the tables' jd is geometric along VGS, so the log is linear in VGS within a table
 * cell and Newton lands on the root in a step or two, where on the current itself a step from below in weak inversion
 * overshoots; no current at all reads as below any positive one — else as the difference (jd is linear in VDS within
 * a cell). NaN outside the table. `slope` from the same lookup where the slice has exact slopes, else NaN. Hot
 * callers keep one and move it (`of`, `along`) instead of building a closure per search.
 */
export class CurrentLine implements FallingSloped {
  slice: LengthSlice = null as unknown as LengthSlice;
  w = 0;
  i = 0;
  g0 = 0;
  d0 = 0;
  s0 = 0;
  dg = 0;
  dd = 0;
  ds = 0;
  excess = false;
  log = true;
  slope = 0;

  /** The device, the current held against, and how (see above). */
  of(slice: LengthSlice, w: number, i: number, excess: boolean, log: boolean): this {
    this.slice = slice;
    this.w = w;
    this.i = i;
    this.excess = excess;
    this.log = log;
    return this;
  }

  /** The line: (VGS, VDS, VSB) = (g0, d0, s0) + x·(dg, dd, ds). */
  along(g0: number, d0: number, s0: number, dg: number, dd: number, ds: number): this {
    this.g0 = g0;
    this.d0 = d0;
    this.s0 = s0;
    this.dg = dg;
    this.dd = dd;
    this.ds = ds;
    return this;
  }

  at(x: number): number {
    const s = this.slice;
    const vgs = this.g0 + this.dg * x;
    const vds = this.d0 + this.dd * x;
    const vsb = this.s0 + this.ds * x;
    let j: number;
    let dj = NaN;
    if (s.jdSlopes) {
      at3[0] = vgs;
      at3[1] = vds;
      at3[2] = vsb;
      if (!s.jdSlopes(at3, s4)) return NaN;
      j = this.w * s4[0];
      dj = this.w * (this.dg * s4[1] + this.dd * s4[2] + this.ds * s4[3]);
    } else {
      if (!covers(s, vgs, vds, vsb)) return NaN;
      j = this.w * s.jd(vgs, vds, vsb);
    }
    const sign = this.excess ? 1 : -1;
    if (!this.log) {
      this.slope = sign * dj;
      return sign * (j - this.i);
    }
    this.slope = (sign * dj) / j;
    return sign * (j > 0 ? Math.log(j / this.i) : -Infinity);
  }
}
