/** Exact powers of ten: 10^k is a double without rounding for k <= 22. */
const POW10 = Float64Array.from({ length: 23 }, (_, k) => Number(`1e${k}`));

/** Where the cell read by the last readNumberCell call ends: its delimiter, a line feed, or the end of the bytes. */
export let cellEnd = 0;

/**
 * Read the cell starting at byte `i`, cells split by `delimiter` and lines by
 * LF (`end` is the end of the bytes): returns its number and sets `cellEnd`;
 * NaN when the cell is anything but plain `[+-]digits[.digits][e[+-]digits]`
 * (blanks, and a CR before the line feed, around it allowed) with at most 15 significant digits and a decimal exponent within
 * ±22 — the caller then reads the cell's text with the general reader. Inside
 * those limits the result is the correctly rounded double, equal to
 * `Number(text)`: mantissa and power of ten are both exact doubles and one
 * multiplication or division rounds once (Clinger, "How to read floating point
 * numbers accurately", PLDI 1990, the fast path). One pass over the bytes.
 */
export function readNumberCell(b: Uint8Array, i: number, end: number, delimiter: number): number {
  const tab = delimiter === 9 ? -1 : 9; // a tab is a blank unless it separates cells
  let c = i < end ? b[i] : 10;
  while (c === 32 || c === tab) c = ++i < end ? b[i] : 10;
  let negative = false;
  if (c === 45 || c === 43) {
    negative = c === 45;
    c = ++i < end ? b[i] : 10;
  }
  let mantissa = 0;
  let digits = 0;
  let scale = 0;
  let any = false;
  let ok = true;
  while (c >= 48 && c <= 57) {
    any = true;
    if (mantissa !== 0 || c !== 48) {
      if (++digits > 15) ok = false;
      mantissa = mantissa * 10 + (c - 48);
    }
    c = ++i < end ? b[i] : 10;
  }
  if (c === 46) {
    c = ++i < end ? b[i] : 10;
    while (c >= 48 && c <= 57) {
      any = true;
      scale--;
      if (mantissa !== 0 || c !== 48) {
        if (++digits > 15) ok = false;
        mantissa = mantissa * 10 + (c - 48);
      }
      c = ++i < end ? b[i] : 10;
    }
  }
  if ((c === 101 || c === 69) && any) {
    c = ++i < end ? b[i] : 10;
    let eNeg = false;
    if (c === 45 || c === 43) {
      eNeg = c === 45;
      c = ++i < end ? b[i] : 10;
    }
    let e = 0;
    let eAny = false;
    while (c >= 48 && c <= 57) {
      eAny = true;
      if (e < 10000) e = e * 10 + (c - 48);
      c = ++i < end ? b[i] : 10;
    }
    if (!eAny) ok = false;
    scale += eNeg ? -e : e;
  }
  while (c === 32 || c === tab || c === 13) c = ++i < end ? b[i] : 10;
  if (c !== delimiter && c !== 10) {
    // Something else in the cell: find its end, let the general reader decide.
    while (i < end && b[i] !== delimiter && b[i] !== 10) i++;
    cellEnd = i;
    return NaN;
  }
  cellEnd = i;
  if (!any || !ok) return NaN;
  let v: number;
  if (mantissa === 0) v = 0;
  else if (scale === 0) v = mantissa;
  else if (scale > 0 && scale <= 22) v = mantissa * POW10[scale];
  else if (scale < 0 && scale >= -22) v = mantissa / POW10[-scale];
  else return NaN;
  return negative ? -v : v;
}
