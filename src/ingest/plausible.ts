import { StackwrightError } from '../errors.js';
import { formatEng, showText } from '../units/index.js';
import type { Quantity } from './types.js';

/**
 * Magnitude ranges a MOSFET sweep can physically hold, per quantity (SI). A
 * column outside is almost always a header unit that does not match the values
 * (`L [um]` over metres, `Id [uA]` over amperes), so it is refused rather than
 * stored a million times off. Lengths and widths: every value; voltages,
 * currents, capacitances: the largest magnitude of the column (a sweep starts
 * at 0 V and at off-state currents, so the smallest says nothing).
 * Bounds are common practice for integrated MOSFETs: channels from nanometres
 * to a millimetre, supplies well under 100 V, drain currents up to amperes,
 * terminal capacitances from attofarads to nanofarads at the reference width.
 */
interface Bound {
  what: string;
  unit: string;
  lo: number;
  hi: number;
  /** Check every value (sizes) or only the column's largest magnitude. */
  every: boolean;
}

const BOUNDS: Partial<Record<Quantity, Bound>> = {
  l: { what: 'channel lengths', unit: 'm', lo: 1e-9, hi: 1e-3, every: true },
  w: { what: 'widths', unit: 'm', lo: 1e-9, hi: 1e-2, every: true },
  vgs: { what: 'a VGS sweep', unit: 'V', lo: 10e-3, hi: 100, every: false },
  vds: { what: 'a VDS sweep', unit: 'V', lo: 10e-3, hi: 100, every: false },
  vsb: { what: 'body biases', unit: 'V', lo: 0, hi: 100, every: false },
  vbs: { what: 'body biases', unit: 'V', lo: 0, hi: 100, every: false },
  id: { what: 'drain currents', unit: 'A', lo: 1e-9, hi: 10, every: false },
  cgg: { what: 'capacitances', unit: 'F', lo: 1e-18, hi: 1e-9, every: false },
  cgs: { what: 'capacitances', unit: 'F', lo: 1e-18, hi: 1e-9, every: false },
  cgd: { what: 'capacitances', unit: 'F', lo: 1e-18, hi: 1e-9, every: false },
  cdd: { what: 'capacitances', unit: 'F', lo: 1e-18, hi: 1e-9, every: false },
};

/** Smallest and largest magnitude of a column. */
export function magnitudeRange(a: Float64Array): { min: number; max: number } {
  let min = Infinity;
  let max = 0;
  for (let i = 0; i < a.length; i++) {
    const v = a[i] < 0 ? -a[i] : a[i];
    if (v < min) min = v;
    if (v > max) max = v;
  }
  return { min, max };
}

const show = (x: number, unit: string) => formatEng(x, unit, 3);

/**
 * Refuse a column whose values cannot be what its header says. Sizes: located
 * at the header cell when every value is off (a unit mistake), else at the first
 * offending row. Other columns: at the row holding a too-large largest value, or
 * at the header when even the largest is too small.
 */
export function checkPlausible(q: Quantity, header: string, values: Float64Array, headerWhere: string, cellWhere: (row: number) => string): void {
  const b = BOUNDS[q];
  if (!b || values.length === 0) return;
  const { min, max } = magnitudeRange(values);
  const low = b.every ? min : max;
  if (low >= b.lo && max <= b.hi) return;
  const found = min === max ? show(max, b.unit) : `${show(min, b.unit)}..${show(max, b.unit)}`;
  const expect = b.every ? `each between ${show(b.lo, b.unit)} and ${show(b.hi, b.unit)}` : b.lo > 0 ? `a largest magnitude between ${show(b.lo, b.unit)} and ${show(b.hi, b.unit)}` : `magnitudes up to ${show(b.hi, b.unit)}`;
  const tail = `are implausible for ${b.what} (expected ${expect}); check the unit in the header or name one with --map`;
  if (!b.every) {
    // Too large: shown at the row holding the largest value; too small: the whole column, at its header.
    let at = -1;
    if (max > b.hi) for (let i = 0; i < values.length && at < 0; i++) if (values[i] === max || values[i] === -max) at = i;
    throw new StackwrightError(`column ${showText(header)}: values ${found} ${tail}`, { where: at >= 0 ? cellWhere(at) : headerWhere });
  }
  const bad = (v: number) => (v < 0 ? -v : v) > b.hi || (v < 0 ? -v : v) < b.lo;
  let first = -1;
  let count = 0;
  for (let i = 0; i < values.length; i++) {
    if (bad(values[i])) {
      if (first < 0) first = i;
      count++;
    }
  }
  if (first >= 0 && count < values.length) {
    const v = values[first] < 0 ? -values[first] : values[first];
    throw new StackwrightError(`column ${showText(header)}: value ${show(v, b.unit)} in this row (column range ${found}) ${tail.replace(/^are/, 'is')}`, { where: cellWhere(first) });
  }
  throw new StackwrightError(`column ${showText(header)}: values ${found} ${tail}`, { where: headerWhere });
}

/**
 * A device's drain current has one sign (after simulator signs are removed);
 * a row of the other sign clearly above numerical noise (1e-6 of the largest
 * current) is a sign-flipped export or a row from another device. Returns the
 * index of the first such row, or -1.
 */
export function oppositeSignRow(id: Float64Array): number {
  const { max } = magnitudeRange(id);
  const floor = 1e-6 * max;
  for (let i = 0; i < id.length; i++) if (id[i] < -floor) return i;
  return -1;
}

export function allZero(a: Float64Array): boolean {
  for (let i = 0; i < a.length; i++) if (a[i] !== 0) return false;
  return true;
}
