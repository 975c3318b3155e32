import { formatEng } from '../units/index.js';

/** Areas in µm²: an SI prefix on m² ("pm²") would misread as (pm)². */
export function formatArea(m2: number): string {
  if (!Number.isFinite(m2)) return '—'; // no design at all; never print NaN
  return `${Number((m2 * 1e12).toPrecision(3))} µm²`;
}

/** Lengths for legends, in µm as designers quote them: "L = 0.18 µm". */
export function formatMicrons(m: number): string {
  if (!Number.isFinite(m)) return '—';
  return `${Number((m * 1e6).toPrecision(3))} µm`;
}

export function formatPercent(fraction: number): string {
  if (!Number.isFinite(fraction)) return '—';
  // Three decimals of a percent everywhere σ and its target are shown (tables, verdicts, port rows),
  // so one σ never reads as two numbers ("2 %" in a table, "1.995 %" in a verdict).
  return `${(fraction * 100).toFixed(3)} %`;
}

/** formatEng that prints "never" for Infinity (e.g. a headroom that is never reached). */
export function eng(x: number, unit: string, digits = 3): string {
  if (x === Infinity) return 'never';
  if (Number.isNaN(x)) return '—';
  return formatEng(x, unit, digits);
}

/**
 * A provided headroom as every table and line shows it: the library rounds it up to the whole mV, and the text shows
 * that mV, above 1 V too ("1.437 V", not "1.44 V", which would read as another number and could read below a target
 * the design misses). "never" when it is never reached.
 */
export function formatHeadroom(h: number): string {
  return Number.isFinite(h) && Math.abs(h) >= 1 ? formatEng(h, 'V', 4) : eng(h, 'V');
}

/**
 * Two figures compared in one sentence ("rout 99.997 MΩ < 100 MΩ"): with `digits` significant digits, more (up to 6)
 * only when they differ but would print alike, so a miss never reads "100 MΩ < 100 MΩ".
 */
export function apart(a: number, b: number, show: (x: number, digits: number) => string, digits = 3): [string, string] {
  for (let d = digits; d < 6 && a !== b; d++) {
    const pair: [string, string] = [show(a, d), show(b, d)];
    if (pair[0] !== pair[1]) return pair;
  }
  return [show(a, a === b ? digits : 6), show(b, a === b ? digits : 6)];
}

/** "n-type" / "p-type". */
export function polarityName(p: 'n' | 'p'): string {
  return `${p}-type`;
}

/** Per-volt quantities (gm/ID, λ) as plain numbers: an SI prefix would read as a unit ("79.7 m/V"). */
export function perVolt(x: number): string {
  if (!Number.isFinite(x)) return eng(x, '');
  return `${Number(x.toPrecision(3))} /V`;
}
