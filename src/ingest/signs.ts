import type { Polarity } from '../table/types.js';
import type { Samples } from './types.js';

/** Negate in place when most non-zero values are negative (simulator signs); keep already-positive data. */
export function toMagnitudeByMajority(a: Float64Array): boolean {
  let neg = 0;
  let pos = 0;
  for (let i = 0; i < a.length; i++) {
    if (a[i] < 0) neg++;
    else if (a[i] > 0) pos++;
  }
  if (neg <= pos) return false;
  for (let i = 0; i < a.length; i++) a[i] = a[i] === 0 ? 0 : -a[i];
  return true;
}

export function absInPlace(a: Float64Array): void {
  for (let i = 0; i < a.length; i++) a[i] = Math.abs(a[i]);
}

/**
 * Simulator signs to magnitudes. PMOS: vgs, vds, id and vsb (source-to-bulk,
 * negative in simulator signs) are negated when mostly negative. Either type:
 * a mostly negative id (current measured out of the drain) is negated, and
 * conductances and capacitances are made positive.
 */
export function normaliseSigns(columns: Samples['columns'], device: Polarity): void {
  if (device === 'p') {
    toMagnitudeByMajority(columns.vgs);
    toMagnitudeByMajority(columns.vds);
    toMagnitudeByMajority(columns.vsb);
  }
  toMagnitudeByMajority(columns.id);
  for (const q of ['gm', 'gds', 'gmb', 'cgg', 'cgs', 'cgd', 'cdd'] as const) {
    const a = columns[q];
    if (a) absInPlace(a);
  }
}

/** First negative value when most non-zero values are negative, else -1 (an n-type sweep has VGS, VDS >= 0). */
export function mostlyNegativeAt(a: Float64Array): number {
  let neg = 0;
  let pos = 0;
  let first = -1;
  for (let i = 0; i < a.length; i++) {
    if (a[i] < 0) {
      if (neg++ === 0) first = i;
    } else if (a[i] > 0) pos++;
  }
  return neg > pos ? first : -1;
}
