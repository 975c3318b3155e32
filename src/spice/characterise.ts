import { StackwrightError } from '../errors.js';
import { formatSpice } from '../units/index.js';
import type { Polarity } from '../table/types.js';
import { includeLines } from './include.js';

export interface SweepRange {
  from: number;
  to: number;
  step: number;
}

/** Voltages are magnitudes; the deck applies PMOS signs itself. */
export interface CharacterisationOptions {
  model: string;
  device: Polarity;
  /** Channel lengths, m. */
  lengths: number[];
  /** Reference width, m. */
  w: number;
  vgs: SweepRange;
  vds: SweepRange;
  /** Source-bulk voltages (magnitudes), V. */
  vsb: number[];
  /** Supply, V: sweeps may not go beyond it. */
  supply?: number;
  /** `.lib`/`.include` line(s) or a model file path. */
  include?: string;
  /** Simulation temperature, °C (omit when the included section sets it). */
  temperature?: number;
}

/** Long-format CSV columns written, in order; simulator sign convention. */
export const CHAR_COLUMNS = ['l', 'w', 'vgs', 'vds', 'vsb', 'id', 'gm', 'gds', 'gmb', 'cgg', 'cgs', 'cgd', 'cdd'] as const;

/** Quantities read per device from ngspice, in wrdata order after v(g), v(d), v(b). */
const PER_DEVICE = ['i', 'gm', 'gds', 'gmbs', 'cgg', 'cgs', 'cgd', 'cdd'] as const;

export function dataFileName(index: number): string {
  return `char-vsb${index}.dat`;
}

/**
 * An ngspice deck that sweeps VGS (inner) and VDS (outer) for each VSB, with
 * one device per length sharing the gate/drain/bulk nodes, and writes one
 * wrdata file per VSB. Each device has a 0 V ammeter so its own drain current
 * keeps the simulator's sign (negative for PMOS).
 */
export function characterisationDeck(opts: CharacterisationOptions): string {
  validate(opts);
  const s = opts.device === 'p' ? -1 : 1;
  const lines: string[] = [
    `* stackwright characterisation deck: ${opts.device}-type model ${opts.model}`,
    `* ${opts.lengths.length} lengths at W=${formatSpice(opts.w)}; columns ${CHAR_COLUMNS.join(',')}`,
    ...includeLines(opts.include),
  ];
  if (opts.temperature !== undefined) lines.push(`.temp ${opts.temperature}`);
  lines.push('vg g 0 0', 'vd d 0 0', 'vb b 0 0');
  opts.lengths.forEach((l, k) => {
    lines.push(`vm${k} d d${k} 0`);
    lines.push(`m${k} d${k} g 0 b ${opts.model} w=${formatSpice(opts.w)} l=${formatSpice(l)}`);
  });
  const save = ['v(g)', 'v(d)', 'v(b)', ...opts.lengths.flatMap((_, k) => deviceVectors(k))];
  lines.push('.options reltol=1e-6 abstol=1e-15 vntol=1e-9', '.control', 'set wr_singlescale', 'set wr_vecnames', 'option numdgt=10');
  lines.push(`save ${save.join(' ')}`);
  const g = opts.vgs;
  const d = opts.vds;
  opts.vsb.forEach((vsb, i) => {
    // vbs = -vsb for NMOS; for PMOS the bulk sits above the source: vbs = +vsb.
    lines.push(`alter vb dc = ${num(-s * vsb)}`);
    lines.push(`dc vg ${num(s * g.from)} ${num(s * g.to)} ${num(s * g.step)} vd ${num(s * d.from)} ${num(s * d.to)} ${num(s * d.step)}`);
    lines.push(`wrdata ${dataFileName(i)} ${save.join(' ')}`);
    lines.push('destroy all');
  });
  lines.push('quit', '.endc', '.end', '');
  return lines.join('\n');
}

function deviceVectors(k: number): string[] {
  return PER_DEVICE.map((q) => (q === 'i' ? `i(vm${k})` : `@m${k}[${q}]`));
}

function num(x: number): string {
  return Number(x.toPrecision(12)).toString();
}

function validate(o: CharacterisationOptions): void {
  const where = (k: string) => `characterise: ${k}`;
  if (!/^[A-Za-z_][\w.$-]*$/.test(o.model)) throw new StackwrightError(`model name "${o.model}" is not a SPICE identifier`, { where: where('model') });
  if (o.lengths.length === 0) throw new StackwrightError('at least one length is needed', { where: where('lengths') });
  o.lengths.forEach((l, i) => {
    if (!(l > 0) || !Number.isFinite(l)) throw new StackwrightError(`length must be > 0 m, got ${l}`, { where: where(`lengths[${i}]`) });
  });
  if (!(o.w > 0)) throw new StackwrightError(`width must be > 0 m, got ${o.w}`, { where: where('w') });
  for (const key of ['vgs', 'vds'] as const) {
    const r = o[key];
    if (!(r.step > 0)) throw new StackwrightError(`step must be > 0 V, got ${r.step}`, { where: where(`${key}.step`) });
    if (!(r.to > r.from) || r.from < 0) throw new StackwrightError(`need 0 <= from < to, got ${r.from}..${r.to}`, { where: where(key) });
    if (o.supply !== undefined && r.to > o.supply + 1e-12) {
      throw new StackwrightError(`sweep end ${r.to} V is above the supply ${o.supply} V`, { where: where(`${key}.to`) });
    }
  }
  if (o.vsb.length === 0) throw new StackwrightError('at least one VSB value is needed', { where: where('vsb') });
  o.vsb.forEach((v, i) => {
    if (!(v >= 0) || !Number.isFinite(v)) throw new StackwrightError(`VSB must be a magnitude >= 0 V, got ${v}`, { where: where(`vsb[${i}]`) });
  });
}

export { PER_DEVICE };
