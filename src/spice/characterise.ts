import { StackwrightError } from '../errors.js';
import { formatSpice, showValue } from '../units/index.js';
import type { Polarity } from '../table/types.js';
import { includeLines } from './include.js';

export interface SweepRange {
  from: number;
  to: number;
  step: number;
}

/** A transistor terminal, as a subcircuit's pin order lists them. */
export type Pin = 'd' | 'g' | 's' | 'b';
export const DEFAULT_PINS: readonly Pin[] = ['d', 'g', 's', 'b'];

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
  /**
   * Instance letter: `m` (default) places the model as a MOSFET; `x` places it as a
   * subcircuit, as foundry kits often wrap their transistors.
   */
  instance?: 'm' | 'x';
  /** Order of the instance's pins (default d, g, s, b). */
  pins?: readonly Pin[];
  /** With `x`: the name of the MOSFET inside the subcircuit whose operating point is read (e.g. `m1`). */
  inner?: string;
  /**
   * Model whose overlap parameters (cgso, cgdo, cgbo, cf, dwc, dlc; BSIM3/BSIM4 names) are
   * added to the intrinsic capacitances. Default: `model` for `m`; required for `x`.
   */
  innerModel?: string;
  /** File the deck writes (ngspice `wrdata`), relative to where ngspice runs. */
  dataFile?: string;
}

/** Long-format columns the deck writes, in order, under these names; simulator sign convention. */
export const CHAR_COLUMNS = ['l', 'w', 'vgs', 'vds', 'vsb', 'id', 'gm', 'gds', 'gmb', 'cgg', 'cgs', 'cgd', 'cdd'] as const;

export const DEFAULT_DATA_FILE = 'characterisation.dat';

/** The data file a deck at `deckPath` writes: same base name, `.dat`, beside where ngspice runs. */
export function dataFileFor(deckPath: string): string {
  const base = deckPath.replace(/^.*[\\/]/, '').replace(/\.[^.]*$/, '');
  return `${base === '' ? 'characterisation' : base}.dat`;
}

/** ngspice name of device k's MOSFET: `m0`, or `m.x0.<inner>` inside a subcircuit instance. */
export function devicePath(opts: Pick<CharacterisationOptions, 'instance' | 'inner'>, k: number): string {
  return opts.instance === 'x' ? `m.x${k}.${opts.inner}` : `m${k}`;
}

/**
 * An ngspice deck that sweeps VGS (inner) and VDS (outer) for each VSB, with
 * one device per length sharing the gate/drain/bulk nodes. Each device has a
 * 0 V ammeter so its own drain current keeps the simulator's sign. For every
 * VSB and length it appends to one data file, in the columns and names that
 * `ingest` reads as they are (space-separated, one header line, SI units).
 *
 * Capacitances: ngspice reports BSIM intrinsic charge derivatives only, so the
 * deck adds the overlap capacitances of the model card, (cgso + cf)·Weff,
 * (cgdo + cf)·Weff and cgbo·Leff with Weff = W − 2·dwc, Leff = L − 2·dlc (BSIM4
 * manual, overlap and fringing capacitance; the bias-dependent cgsl/cgdl part is
 * left out), and the drain-bulk junction capacitance (capbd) to cdd. Below,
 * cgso and cgdo include cf:
 *   cgg = Cgg + (cgso + cgdo)·Weff + cgbo·Leff, cgs = −dQg/dVs + cgso·Weff,
 *   cgd = −dQg/dVd + cgdo·Weff, cdd = dQd/dVd + cgdo·Weff + capbd.
 */
export function characterisationDeck(opts: CharacterisationOptions): string {
  validate(opts);
  const s = opts.device === 'p' ? -1 : 1;
  const file = opts.dataFile ?? DEFAULT_DATA_FILE;
  const x = opts.instance === 'x';
  const card = opts.innerModel ?? opts.model;
  const pins = opts.pins ?? DEFAULT_PINS;
  const lines: string[] = [
    `* stackwright characterisation deck: ${opts.device}-type model ${opts.model}${x ? ` (subcircuit, reading ${opts.inner} inside)` : ''}`,
    `* ${opts.lengths.length} lengths at W=${formatSpice(opts.w)}. Run it with: ngspice -b <this file>`,
    `* It writes ${file} (columns ${CHAR_COLUMNS.join(',')}), which "stackwright ingest" reads as it is.`,
    ...includeLines(opts.include),
  ];
  if (opts.temperature !== undefined) lines.push(`.temp ${opts.temperature}`);
  lines.push('vg g 0 0', 'vd d 0 0', 'vb b 0 0');
  opts.lengths.forEach((l, k) => {
    const node: Record<Pin, string> = { d: `d${k}`, g: 'g', s: '0', b: 'b' };
    lines.push(`vm${k} d d${k} 0`);
    lines.push(`${x ? 'x' : 'm'}${k} ${pins.map((p) => node[p]).join(' ')} ${opts.model} w=${formatSpice(opts.w)} l=${formatSpice(l)}`);
  });
  const dev = (k: number) => devicePath(opts, k);
  const save = ['v(g)', 'v(d)', 'v(b)', ...opts.lengths.flatMap((_, k) => [`i(vm${k})`, ...['gm', 'gds', 'gmbs', 'cgg', 'cgs', 'cgd', 'cdd', 'capbd'].map((q) => `@${dev(k)}[${q}]`)])];
  lines.push('.options reltol=1e-6 abstol=1e-15 vntol=1e-9', '.control', 'set wr_singlescale', 'set wr_vecnames', 'option numdgt=10');
  lines.push(`save ${save.join(' ')}`);
  // Overlap capacitances per unit width/length from the card. Read after an analysis, when the model's
  // defaults (cf from toxe, dwc from wint) are set up, and again after each, since `destroy all` drops them.
  // The fringing capacitance cf adds to both overlaps per width, as BSIM3/BSIM4 stamp it.
  const overlap = [
    `let dwc_ = @${card}[dwc]`, `let dlc_ = @${card}[dlc]`, `let cf_ = @${card}[cf]`,
    `let cgso_ = @${card}[cgso] + cf_`, `let cgdo_ = @${card}[cgdo] + cf_`, `let cgbo_ = @${card}[cgbo]`,
    `let weff_ = ${num(opts.w)} - 2*dwc_`,
  ];
  const g = opts.vgs;
  const d = opts.vds;
  let first = true;
  opts.vsb.forEach((vsb) => {
    // vbs = -vsb for NMOS; for PMOS the bulk sits above the source: vbs = +vsb.
    lines.push(`alter vb dc = ${num(-s * vsb)}`);
    lines.push(`dc vg ${num(s * g.from)} ${num(s * g.to)} ${num(s * g.step)} vd ${num(s * d.from)} ${num(s * d.to)} ${num(s * d.step)}`);
    lines.push(...overlap);
    opts.lengths.forEach((l, k) => {
      const m = dev(k);
      lines.push(
        `let l = 0*v(g) + ${num(l)}`,
        `let w = 0*v(g) + ${num(opts.w)}`,
        'let vgs = v(g)',
        'let vds = v(d)',
        'let vsb = -v(b)',
        `let id = i(vm${k})`,
        `let gm = @${m}[gm]`,
        `let gds = @${m}[gds]`,
        `let gmb = @${m}[gmbs]`,
        `let cgg = @${m}[cgg] + (cgso_ + cgdo_)*weff_ + cgbo_*(${num(l)} - 2*dlc_)`,
        `let cgs = -@${m}[cgs] + cgso_*weff_`,
        `let cgd = -@${m}[cgd] + cgdo_*weff_`,
        `let cdd = @${m}[cdd] + cgdo_*weff_ + @${m}[capbd]`,
        `wrdata ${file} ${CHAR_COLUMNS.join(' ')}`,
      );
      if (first) {
        // One header line, then rows appended: the file reads as one table.
        lines.push('unset wr_vecnames', 'set appendwrite');
        first = false;
      }
    });
    lines.push('destroy all');
  });
  lines.push('quit', '.endc', '.end', '');
  return lines.join('\n');
}

function num(x: number): string {
  return Number(x.toPrecision(12)).toString();
}

const IDENT = /^[A-Za-z_][\w.$:-]*$/;

function validate(o: CharacterisationOptions): void {
  const where = (k: string) => `characterise: ${k}`;
  if (!IDENT.test(o.model)) throw new StackwrightError(`model name "${o.model}" is not a SPICE identifier`, { where: where('model') });
  if (o.instance !== undefined && o.instance !== 'm' && o.instance !== 'x') {
    throw new StackwrightError(`instance must be m (a MOSFET) or x (a subcircuit), got "${String(o.instance)}"`, { where: where('instance') });
  }
  if (o.instance === 'x') {
    if (o.inner === undefined || !/^m[\w$]*$/i.test(o.inner)) {
      throw new StackwrightError(`a subcircuit needs the name of the MOSFET inside it whose operating point is read (e.g. m1), got ${o.inner === undefined ? 'none' : `"${o.inner}"`}`, { where: where('inner') });
    }
    if (o.innerModel === undefined) {
      throw new StackwrightError('a subcircuit needs the model of the MOSFET inside it, whose overlap capacitances (cgso, cgdo, cgbo) are added', { where: where('innerModel') });
    }
  }
  if (o.innerModel !== undefined && !IDENT.test(o.innerModel)) throw new StackwrightError(`model name "${o.innerModel}" is not a SPICE identifier`, { where: where('innerModel') });
  if (o.pins !== undefined) {
    const sorted = [...o.pins].sort().join(',');
    if (o.pins.length !== 4 || sorted !== 'b,d,g,s') {
      throw new StackwrightError(`pin order must name d, g, s and b once each, got "${o.pins.join(',')}"`, { where: where('pins') });
    }
  }
  if (o.dataFile !== undefined && !/^[\w.+-]+$/.test(o.dataFile)) {
    throw new StackwrightError(`data file name "${o.dataFile}" may hold only letters, digits and . _ + -`, { where: where('dataFile') });
  }
  if (o.lengths.length === 0) throw new StackwrightError('at least one length is needed', { where: where('lengths') });
  o.lengths.forEach((l, i) => {
    if (!(l > 0) || !Number.isFinite(l)) throw new StackwrightError(`length must be > 0 m, got ${showValue(l, 'm')}`, { where: where(`lengths[${i}]`) });
  });
  if (!(o.w > 0)) throw new StackwrightError(`width must be > 0 m, got ${showValue(o.w, 'm')}`, { where: where('w') });
  for (const key of ['vgs', 'vds'] as const) {
    const r = o[key];
    if (!(r.step > 0)) throw new StackwrightError(`step must be > 0 V, got ${showValue(r.step, 'V')}`, { where: where(`${key}.step`) });
    if (!(r.to > r.from) || r.from < 0) throw new StackwrightError(`need 0 V <= from < to, got ${showValue(r.from, 'V')}..${showValue(r.to, 'V')}`, { where: where(key) });
    if (o.supply !== undefined && r.to > o.supply + 1e-12) {
      throw new StackwrightError(`sweep end ${showValue(r.to, 'V')} is above the supply ${showValue(o.supply, 'V')}`, { where: where(`${key}.to`) });
    }
  }
  if (o.vsb.length === 0) throw new StackwrightError('at least one VSB value is needed', { where: where('vsb') });
  o.vsb.forEach((v, i) => {
    if (!(v >= 0) || !Number.isFinite(v)) throw new StackwrightError(`VSB must be a magnitude >= 0 V, got ${showValue(v, 'V')}`, { where: where(`vsb[${i}]`) });
  });
}
