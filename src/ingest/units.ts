import type { Quantity } from './types.js';

/** SI prefixes as written in header units; case matters (m milli, M mega). */
const PREFIX: Record<string, number> = {
  a: 1e-18, f: 1e-15, p: 1e-12, n: 1e-9, u: 1e-6, 'µ': 1e-6, 'μ': 1e-6, m: 1e-3,
  '': 1, k: 1e3, K: 1e3, M: 1e6, G: 1e9, T: 1e12,
};

/** Base unit spellings per dimension, lower case. */
const BASES: Record<string, readonly string[]> = {
  length: ['m', 'metre', 'meter', 'metres', 'meters'],
  voltage: ['v', 'volt', 'volts'],
  current: ['a', 'amp', 'amps', 'ampere', 'amperes'],
  conductance: ['s', 'a/v', 'mho', 'siemens'],
  capacitance: ['f', 'farad', 'farads'],
};

export function dimensionOf(q: Quantity): keyof typeof BASES {
  if (q === 'l' || q === 'w') return 'length';
  if (q === 'vgs' || q === 'vds' || q === 'vsb' || q === 'vbs') return 'voltage';
  if (q === 'id') return 'current';
  if (q === 'gm' || q === 'gds' || q === 'gmb') return 'conductance';
  return 'capacitance';
}

/**
 * Scale factor to SI for a header unit such as "um", "uA", "fF", "mS"; undefined
 * when `unit` is not a unit of the quantity's dimension.
 */
export function unitScale(unit: string, q: Quantity): number | undefined {
  const u = unit.trim();
  if (u === '') return 1;
  const dim = dimensionOf(q);
  if (dim === 'length' && /^microns?$/i.test(u)) return 1e-6;
  const lower = u.toLowerCase();
  for (const base of BASES[dim]) {
    if (lower === base) return 1;
    if (lower.endsWith(base)) {
      const scale = PREFIX[u.slice(0, u.length - base.length)];
      if (scale !== undefined) return scale;
    }
  }
  return undefined;
}

export function unitExamples(q: Quantity): string {
  const examples: Record<string, string> = { length: 'm, um, nm', voltage: 'V, mV', current: 'A, mA, uA, nA', conductance: 'S, mS, uS, A/V', capacitance: 'F, pF, fF' };
  return examples[dimensionOf(q)];
}
