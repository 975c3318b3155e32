import type { LengthSlice } from '../device/types.js';
import { covers } from './range.js';

const s4 = new Float64Array(4);

/** gm/ID at a bias; +Infinity where the device carries no current (square-law cut-off). */
export function gmidAt(slice: LengthSlice, vgs: number, vds: number, vsb: number): number {
  const s = slice.small(vgs, vds, vsb, s4);
  return s[0] > 0 ? s[1] / s[0] : Infinity;
}

/** VDS used for a gm/ID lookup: a fixed value, or 'diode' for VDS = VGS. */
export type VdsMode = number | 'diode';

function vdsOf(mode: VdsMode, vgs: number): number {
  return mode === 'diode' ? vgs : mode;
}

/** The VGS interval over which (vgs, vds(vgs), vsb) stays inside the table. */
export function vgsWindow(slice: LengthSlice, mode: VdsMode, vsb: number): [number, number] | null {
  const r = slice.range;
  let lo = r.vgs[0];
  let hi = r.vgs[1];
  if (mode === 'diode') {
    lo = Math.max(lo, r.vds[0]);
    hi = Math.min(hi, r.vds[1]);
  } else if (!covers(slice, lo, mode, vsb)) return null;
  if (!(vsb >= r.vsb[0] - 1e-9 && vsb <= r.vsb[1] + 1e-9) || hi <= lo) return null;
  return [lo, hi];
}

const SCAN = 48;

/**
 * VGS at which gm/ID equals `target` at the given VDS (or diode) and VSB.
 * gm/ID falls with VGS above weak inversion, so scan down from the top of the
 * table for the first sample at or above the target, then bisect. Null when
 * the table does not reach the target.
 */
export function vgsForGmid(slice: LengthSlice, target: number, mode: VdsMode, vsb: number): number | null {
  const win = vgsWindow(slice, mode, vsb);
  if (!win) return null;
  const [lo, hi] = win;
  const f = (vgs: number) => gmidAt(slice, vgs, vdsOf(mode, vgs), vsb) - target;
  let b = hi;
  if (f(b) >= 0) return null;
  let a = b;
  for (let j = SCAN - 1; j >= 0; j--) {
    a = lo + ((hi - lo) * j) / SCAN;
    if (f(a) >= 0) break;
    b = a;
    if (j === 0) return null;
  }
  for (let it = 0; it < 40 && b - a > 1e-9; it++) {
    const m = 0.5 * (a + b);
    if (f(m) >= 0) a = m;
    else b = m;
  }
  return 0.5 * (a + b);
}

/**
 * VGS at which w·jd(vgs, vds, vsb) = i, jd rising with VGS (also for a diode,
 * where VDS = VGS). Null when the table does not reach the current.
 */
export function vgsForCurrent(slice: LengthSlice, w: number, i: number, mode: VdsMode, vsb: number): number | null {
  const win = vgsWindow(slice, mode, vsb);
  if (!win) return null;
  let [a, b] = win;
  const f = (vgs: number) => w * slice.jd(vgs, vdsOf(mode, vgs), vsb) - i;
  if (f(b) < 0 || f(a) > 0) return null;
  for (let it = 0; it < 60 && b - a > 1e-12; it++) {
    const m = 0.5 * (a + b);
    if (f(m) < 0) a = m;
    else b = m;
  }
  return 0.5 * (a + b);
}
