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

/** "n-type" / "p-type". */
export function polarityName(p: 'n' | 'p'): string {
  return `${p}-type`;
}

/** Per-volt quantities (gm/ID, λ) as plain numbers: an SI prefix would read as a unit ("79.7 m/V"). */
export function perVolt(x: number): string {
  if (!Number.isFinite(x)) return eng(x, '');
  return `${Number(x.toPrecision(3))} /V`;
}
