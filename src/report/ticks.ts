import type { ScaleLinear, ScaleLogarithmic } from 'd3-scale';
import { formatEng } from '../units/index.js';

export type ScaleKind = 'linear' | 'log';

export interface Tick {
  value: number;
  /** Empty for minor (unlabelled) ticks. */
  label: string;
}

const PREFIX_SCALE: Record<string, number> = {
  T: 1e12, G: 1e9, M: 1e6, k: 1e3, '': 1, m: 1e-3, 'µ': 1e-6, n: 1e-9, p: 1e-12, f: 1e-15, a: 1e-18,
};

/** The SI prefix formatEng would choose for `x`, so a whole linear axis can share it. */
export function prefixOf(x: number, unit: string): { prefix: string; scale: number } {
  const printed = formatEng(x, unit);
  const space = printed.indexOf(' ');
  const suffix = space < 0 ? '' : printed.slice(space + 1);
  const prefix = unit && suffix.endsWith(unit) ? suffix.slice(0, suffix.length - unit.length) : suffix;
  return prefix in PREFIX_SCALE ? { prefix, scale: PREFIX_SCALE[prefix] } : { prefix: '', scale: 1 };
}

function plain(x: number): string {
  return Number(x.toPrecision(10)).toString();
}

/**
 * Ticks of a linear axis: d3's nice values, labelled with one shared SI prefix
 * ("0.2 V, 0.4 V" rather than "200 mV, 400 mV, 1 V").
 */
export function linearTicks(scale: ScaleLinear<number, number>, count: number, unit: string, si = true): Tick[] {
  const values = scale.ticks(count);
  const biggest = Math.max(...values.map(Math.abs));
  const { prefix, scale: k } = si && biggest > 0 ? prefixOf(biggest, unit) : { prefix: '', scale: 1 };
  const suffix = prefix + unit;
  return values.map((value) => ({
    value,
    label: value === 0 ? `0${unit ? ' ' + unit : ''}` : `${plain(value / k)}${suffix ? ' ' + suffix : ''}`,
  }));
}

/**
 * Ticks of a log axis: exactly d3's ticks; d3's own tickFormat decides which
 * get a label (it blanks crowded subdivisions), our formatter writes it.
 */
export function logTicks(scale: ScaleLogarithmic<number, number>, count: number, unit: string, si = true): Tick[] {
  const fmt = (v: number): string => (si ? formatEng(v, unit) : `${plain(v)}${unit ? ' ' + unit : ''}`);
  // d3-scale accepts a function as specifier (log.tickFormat source); its typings only say string.
  const show = scale.tickFormat(count, fmt as unknown as string);
  return scale.ticks(count).map((value) => ({ value, label: show(value) }));
}
