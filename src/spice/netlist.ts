import { StackwrightError } from '../errors.js';
import { formatEng, formatSpice } from '../units/index.js';
import { CAUTION, type Role, type SizeResult, type StackResult } from '../solve/types.js';
import type { StackSpec } from '../design/types.js';
import { includeLines } from './include.js';
import { bindingText } from '../report/verdict.js';

export interface NetlistOptions {
  /** Supply voltage, V. */
  supply: number;
  /** Model names; default `nmos_model` / `pmos_model` placeholders. */
  models?: { n: string; p: string };
  /** `.lib`/`.include` line(s), or a model file path. */
  include?: string;
  /** Gates from ideal sources at the reported voltages, or from the reported diode bias devices. */
  bias?: 'ideal' | 'diodes';
  /** Stack-voltage sweep, V (default 0 .. supply in 10 mV). */
  sweep?: { from: number; to: number; step: number };
  /**
   * Stack voltage of the `.op` point, V. Default: the stack's mid-span, (headroom + span)/2,
   * where the design current is defined; the middle of the sweep when no targets are known.
   */
  at?: number;
  /** Widest single device, m: wider devices are written as `m` parallel fingers (default 10 µm). */
  maxFingerWidth?: number;
  /** Targets, for the header comment. */
  spec?: Pick<StackSpec, 'current' | 'rout' | 'headroom' | 'span'>;
  title?: string;
}

export const DEFAULT_MODELS = { n: 'nmos_model', p: 'pmos_model' } as const;

/**
 * Default widest finger, m. Layouts split wide devices into parallel fingers of a few µm
 * (common practice); models are characterised at such widths, not at hundreds of µm.
 */
export const MAX_FINGER_WIDTH = 10e-6;

/**
 * Fingers for a device of total width `w`: the fewest of equal width ≤ `max`.
 * SPICE's instance multiplier `m` puts that many identical devices in parallel.
 */
export function fingers(w: number, max = MAX_FINGER_WIDTH): { count: number; width: number } {
  const count = Math.max(1, Math.ceil(w / max - 1e-9));
  return { count, width: w / count };
}

/** `W=.. L=..` plus ` m=N` when the device is split. */
function geometry(w: number, l: number, max: number | undefined): string {
  const f = fingers(w, max);
  return `W=${formatSpice(f.width)} L=${formatSpice(l)}${f.count > 1 ? ` m=${f.count}` : ''}`;
}

function midNote(distinct: number): string {
  return distinct === 1 ? ' (mid-span: (headroom + span)/2)' : " (the first stack's mid-span; each stack's own is on its targets line)";
}

/** Stack voltage where the design current is defined (README: mid-span). */
function midSpanOf(spec: Pick<StackSpec, 'headroom' | 'span'>): number {
  return 0.5 * (spec.headroom + spec.span);
}

/** Names of the sweep source and the stack-voltage node every netlist uses. */
export const SWEEP_SOURCE = 'vstack';
export const SWEEP_NODE = 'vstack';

/** Machine-readable line per stack: `*@probe <tag> <polarity> <ammeter> <name>`. */
export const PROBE_PREFIX = '*@probe';

/** One stack, ready for ngspice: supply, stack, bias, output drive, `.op` and `.dc`. */
export function stackNetlist(result: StackResult, opts: NetlistOptions): string {
  return deck([result], opts, opts.spec ? [opts.spec] : [undefined]);
}

/**
 * All stacks of a sizing run in one deck, each as flat elements with its own
 * prefix; one sweep source drives every output so a single `.dc` covers them.
 */
export function designNetlist(size: SizeResult, opts: Omit<NetlistOptions, 'spec' | 'supply'> & { supply?: number; specs?: StackSpec[] }): string {
  const specs = size.stacks.map((s) => opts.specs?.find((x) => x.name === s.name));
  return deck(size.stacks, { ...opts, supply: opts.supply ?? size.supply }, specs, true);
}

function deck(stacks: readonly StackResult[], opts: NetlistOptions, specs: (NetlistOptions['spec'] | undefined)[], skipEmpty = false): string {
  checkOptions(opts);
  const models = opts.models ?? DEFAULT_MODELS;
  const sweep = opts.sweep ?? { from: 0, to: opts.supply, step: 0.01 };
  // One sweep source serves every stack, so one .op point: the mid-span when the stacks share it
  // (always for one stack); otherwise the first stack's, and each stack's own is noted beside it.
  const mids = [...new Set(specs.flatMap((x, k) => (x && stacks[k].devices.length > 0 ? [midSpanOf(x)] : [])))];
  const at = opts.at ?? mids[0] ?? 0.5 * (sweep.from + sweep.to);
  const lines: string[] = [
    `* ${opts.title ?? 'stackwright cascode netlist'} (Berkeley SPICE3 syntax, tested with ngspice)`,
    `* ${CAUTION}`,
    `* Models: ${models.n} / ${models.p} must name the foundry's NMOS / PMOS models; include them below.`,
    `* Stack voltage v is node ${SWEEP_NODE}: n-type outputs sit at v, p-type outputs at supply - v.`,
  ];
  const inc = includeLines(opts.include);
  lines.push(...(inc.length ? inc : ['* .lib \'/path/to/foundry/models.lib\' tt']));
  lines.push(
    `* .op at stack voltage ${formatEng(at, 'V', 4)}${opts.at === undefined && mids.length > 0 ? midNote(mids.length) : ''}; ` +
      `wide devices are written as parallel fingers (m=) of at most ${formatEng(opts.maxFingerWidth ?? MAX_FINGER_WIDTH, 'm')}`,
  );
  lines.push(`vdd vdd 0 dc ${formatSpice(opts.supply)}`, `${SWEEP_SOURCE} ${SWEEP_NODE} 0 dc ${formatSpice(at)}`);
  const ammeters: string[] = [];
  stacks.forEach((s, k) => {
    // A design may hold stacks the search could not size: note them, keep the deck simulatable.
    if (skipEmpty && s.devices.length === 0) lines.push('', `* ---- stack "${s.name}": not sized (${bindingText(s) || 'infeasible'}), nothing to simulate`);
    else {
      lines.push('', ...stackLines(s, `s${k + 1}`, opts, models, specs[k]));
      ammeters.push(`i(vm_s${k + 1})`);
    }
  });
  lines.push(
    '',
    '* tight tolerances: Rout comes from differences of nA in the sweep',
    '.options reltol=1e-6 abstol=1e-15 vntol=1e-9',
    '.op',
    `.dc ${SWEEP_SOURCE} ${formatSpice(sweep.from)} ${formatSpice(sweep.to)} ${formatSpice(sweep.step)}`,
    // Batch mode runs no .dc without an output line (and its .op then lands at the sweep's start); a .control block replaces it.
    `.print dc v(${SWEEP_NODE}) ${ammeters.join(' ')}`,
    '.end',
    '',
  );
  return lines.join('\n');
}

/** The elements of one stack (tag `tag`), its output following node SWEEP_NODE; used by decks that batch many circuits. */
export function stackLines(
  s: StackResult,
  tag: string,
  opts: NetlistOptions,
  models: { n: string; p: string },
  spec: NetlistOptions['spec'] | undefined,
): string[] {
  const where = `netlist: stack "${s.name}"`;
  if (s.devices.length === 0) throw new StackwrightError('has no sized devices to write', { where });
  const p = s.device === 'p';
  const rail = p ? 'vdd' : '0';
  const model = p ? models.p : models.n;
  const ammeter = `vm_${tag}`;
  const out = `out_${tag}`;
  const pr = s.predicted;
  const lines = [
    `* ---- stack "${s.name}": ${s.device}-type ${s.topology}${p ? ', hanging from the supply' : ', on ground'}${s.feasible ? '' : ` -- INFEASIBLE (${bindingText(s) || 'targets not met'})`}`,
  ];
  if (spec) {
    lines.push(`* targets: iout ${formatEng(spec.current, 'A')}, rout >= ${formatEng(spec.rout, 'ohm')}, headroom ${formatEng(spec.headroom, 'V')}, span ${formatEng(spec.span, 'V')}; mid-span ${formatEng(midSpanOf(spec), 'V', 4)}`);
  }
  lines.push(`* predicted: iout ${shown(pr.iout, 'A')}, rout ${shown(pr.rout, 'ohm')}, headroom ${shown(pr.headroom, 'V')}`);
  lines.push(`${PROBE_PREFIX} ${tag} ${s.device} ${ammeter} ${s.name}`);
  // Output node follows the stack voltage; the ammeter reads iout positive for either type.
  lines.push(p ? `e_${tag} ${out} vdd ${SWEEP_NODE} 0 -1` : `e_${tag} ${out} 0 ${SWEEP_NODE} 0 1`);
  const gates = gateNodes(s, tag, opts, rail, model, p, where, lines);
  let below = rail;
  s.devices.forEach((d, k) => {
    const drain = k === s.devices.length - 1 ? `d_${tag}` : `n${k + 1}_${tag}`;
    lines.push(`m_${tag}_${d.role} ${drain} ${gates.get(d.role)} ${below} ${rail} ${model} ${geometry(d.w, d.l, opts.maxFingerWidth)}`);
    below = drain;
  });
  lines.push(p ? `${ammeter} d_${tag} ${out} dc 0` : `${ammeter} ${out} d_${tag} dc 0`);
  return lines;
}

/** A predicted value for a comment: "never" for a headroom never reached, "n/a" when there is none. */
function shown(x: number, unit: string): string {
  if (x === Infinity) return 'never';
  return Number.isFinite(x) ? formatEng(x, unit) : 'n/a';
}

/** Emit the gate drive (ideal sources or sized bias diodes) and return role -> gate node. */
export function gateNodes(
  s: Pick<StackResult, 'devices' | 'bias'>,
  tag: string,
  opts: NetlistOptions,
  rail: string,
  model: string,
  p: boolean,
  where: string,
  lines: string[],
): Map<Role, string> {
  const nodes = new Map<Role, string>();
  if ((opts.bias ?? 'ideal') === 'ideal') {
    for (const d of s.devices) {
      const g = `g_${tag}_${d.role}`;
      lines.push(`vg_${tag}_${d.role} ${g} 0 dc ${formatSpice(d.gate)}`);
      nodes.set(d.role, g);
    }
    return nodes;
  }
  s.bias.forEach((b, j) => {
    const node = `b${j}_${tag}`;
    const src = b.stackedOn === undefined ? rail : `b${b.stackedOn}_${tag}`;
    if (b.stackedOn !== undefined && !(b.stackedOn >= 0 && b.stackedOn < s.bias.length && b.stackedOn !== j)) {
      throw new StackwrightError(`bias[${j}].stackedOn = ${b.stackedOn} is not another bias device`, { where });
    }
    lines.push(`* bias diode for the ${b.drives} gate: produces ${formatEng(b.voltage, 'V')} at ${formatEng(b.current, 'A')}`);
    lines.push(`m_${tag}_bias${j} ${node} ${node} ${src} ${rail} ${model} ${geometry(b.w, b.l, opts.maxFingerWidth)}`);
    // A diode others sit on already gets their current; feed only what is missing.
    const fromAbove = s.bias.reduce((sum, o) => sum + (o.stackedOn === j ? o.current : 0), 0);
    const feed = b.current - fromAbove;
    if (feed > b.current * 1e-9) {
      lines.push(p ? `i_${tag}_bias${j} ${node} 0 dc ${formatSpice(feed)}` : `i_${tag}_bias${j} vdd ${node} dc ${formatSpice(feed)}`);
    }
    if (!nodes.has(b.drives)) nodes.set(b.drives, node);
  });
  for (const d of s.devices) {
    if (!nodes.has(d.role)) throw new StackwrightError(`no bias device drives the ${d.role} gate; write it with bias 'ideal'`, { where });
  }
  return nodes;
}

function checkOptions(o: NetlistOptions): void {
  if (!(o.supply > 0)) throw new StackwrightError(`supply must be > 0 V, got ${formatEng(o.supply, 'V', 4)}`, { where: 'netlist: supply' });
  const m = o.models ?? DEFAULT_MODELS;
  for (const key of ['n', 'p'] as const) {
    if (!/^[A-Za-z_][\w.$-]*$/.test(m[key])) throw new StackwrightError(`"${m[key]}" is not a SPICE model name`, { where: `netlist: models.${key}` });
  }
  if (o.maxFingerWidth !== undefined && !(o.maxFingerWidth > 0)) {
    throw new StackwrightError(`expected a positive width, got ${formatEng(o.maxFingerWidth, 'm')}`, { where: 'netlist: maxFingerWidth' });
  }
  const s = o.sweep;
  if (s && (!(s.step > 0) || !(s.to > s.from) || s.from < 0 || s.to > o.supply + 1e-12)) {
    throw new StackwrightError(`need 0 <= from < to <= supply and step > 0, got ${formatEng(s.from, 'V', 4)}..${formatEng(s.to, 'V', 4)} step ${formatEng(s.step, 'V', 4)}`, { where: 'netlist: sweep' });
  }
}
