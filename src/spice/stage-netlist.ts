import { StackwrightError } from '../errors.js';
import { formatEng, formatSpice } from '../units/index.js';
import { CAUTION } from '../solve/types.js';
import type { StageResult, StageSide } from '../solve/stage-types.js';
import { includeLines } from './include.js';
import { DEFAULT_MODELS, gateNodes, type NetlistOptions } from './netlist.js';

/** Names of the input source and the nodes a stage deck uses. */
export const STAGE_INPUT_SOURCE = 'vin';
export const STAGE_INPUT_NODE = 'inp';
export const STAGE_OUTPUT_NODE = 'out';

export interface StageNetlistOptions extends Pick<NetlistOptions, 'models' | 'include' | 'bias' | 'title'> {
  supply: number;
  /** Input-voltage sweep, V (default the input DC voltage ± 50 mV in 50 µV steps, within the rails). */
  sweep?: { from: number; to: number; step: number };
}

// One side's devices in series from its rail to the output node; gates from `gates` (role -> node), the input device's from the input node.
function sideLines(side: StageSide, tag: string, models: { n: string; p: string }, gates: Map<string, string>, lines: string[]): void {
  const p = side.device === 'p';
  const rail = p ? 'vdd' : '0';
  const model = p ? models.p : models.n;
  let below = rail;
  side.devices.forEach((d, k) => {
    const drain = k === side.devices.length - 1 ? STAGE_OUTPUT_NODE : `${tag}${k + 1}`;
    const gate = gates.get(d.role);
    if (!gate) throw new StackwrightError(`no drive for the ${d.role} gate`, { where: `netlist: ${tag} side` });
    lines.push(`m_${tag}_${d.role} ${drain} ${gate} ${below} ${rail} ${model} W=${formatSpice(d.w)} L=${formatSpice(d.l)}`);
    below = drain;
  });
}

/**
 * A gain stage for ngspice: supply, load side with its gate drive, input
 * side whose input gate is the DC source `vin` (swept by `.dc`; a `.op` at the
 * design input voltage), cascode gates from ideal sources or their bias diodes.
 * The output node `out` is left open (the DC sweep is the open-loop transfer).
 */
/**
 * The input DC voltage ± 50 mV, kept within the rails. A design whose input DC voltage
 * lies outside the rails (a large current at a low supply) is swept around it as it is,
 * so the deck still reproduces the sized design instead of failing to be written.
 */
function defaultSweep(vin: number, supply: number): { from: number; to: number; step: number } {
  const from = Math.max(0, vin - 0.05);
  const to = Math.min(supply, vin + 0.05);
  return to > from ? { from, to, step: 50e-6 } : { from: vin - 0.05, to: vin + 0.05, step: 50e-6 };
}

export function stageNetlist(stage: StageResult, opts: StageNetlistOptions): string {
  const where = `netlist: stage "${stage.name}"`;
  if (stage.input.devices.length === 0 || stage.load.devices.length === 0) throw new StackwrightError('has no sized devices to write', { where });
  if (!(opts.supply > 0)) throw new StackwrightError(`supply must be > 0 V, got ${opts.supply}`, { where: 'netlist: supply' });
  const models = opts.models ?? DEFAULT_MODELS;
  const vin = stage.input.devices[0].gate;
  const sweep = opts.sweep ?? defaultSweep(vin, opts.supply);
  if (opts.sweep && (!(sweep.step > 0) || !(sweep.to > sweep.from) || sweep.from < 0 || sweep.to > opts.supply + 1e-12)) {
    throw new StackwrightError(
      `need 0 V <= from < to <= supply and step > 0, got ${formatEng(sweep.from, 'V', 4)}..${formatEng(sweep.to, 'V', 4)} step ${formatEng(sweep.step, 'V', 4)}`,
      { where: 'netlist: sweep' },
    );
  }
  const pr = stage.predicted;
  const lines: string[] = [
    `* ${opts.title ?? `stackwright gain stage "${stage.name}"`} (Berkeley SPICE3 syntax, tested with ngspice)`,
    `* ${CAUTION}`,
    `* Models: ${models.n} / ${models.p} must name the foundry's NMOS / PMOS models; include them below.`,
    `* ${stage.input.device}-input ${stage.input.topology} with a ${stage.load.device}-type ${stage.load.topology} load${stage.feasible ? '' : ' -- INFEASIBLE'}`,
    `* predicted: gain ${pr.gain.toPrecision(4)} at vout ${formatEng(pr.output, 'V')} (vin ${formatEng(pr.vin, 'V')}), swing ${formatEng(pr.swing, 'V')}` +
      (pr.vlow !== null && pr.vhigh !== null ? ` (${formatEng(pr.vlow, 'V')} .. ${formatEng(pr.vhigh, 'V')})` : ''),
    `* Sweep ${STAGE_INPUT_SOURCE} and read v(${STAGE_OUTPUT_NODE}): the gain is |dv(${STAGE_OUTPUT_NODE})/dv(${STAGE_INPUT_NODE})|.`,
  ];
  const inc = includeLines(opts.include);
  lines.push(...(inc.length ? inc : ['* .lib \'/path/to/foundry/models.lib\' tt']));
  lines.push(`vdd vdd 0 dc ${formatSpice(opts.supply)}`, `${STAGE_INPUT_SOURCE} ${STAGE_INPUT_NODE} 0 dc ${formatSpice(vin)}`);
  const bias = { bias: opts.bias ?? 'ideal' } as NetlistOptions;
  for (const [tag, side] of [['ld', stage.load], ['in', stage.input]] as const) {
    const p = side.device === 'p';
    lines.push('', `* ---- ${tag === 'ld' ? 'load' : 'input'} side: ${side.device}-type ${side.topology}`);
    // The input device's gate is the input node; the other gates get their drive as a stack's do.
    const fixed = tag === 'in' ? side.devices.slice(1) : side.devices;
    const gates = fixed.length ? gateNodes({ devices: fixed, bias: side.bias }, tag, { ...bias, supply: opts.supply }, p ? 'vdd' : '0', p ? models.p : models.n, p, where, lines) : new Map<string, string>();
    if (tag === 'in') gates.set(side.devices[0].role, STAGE_INPUT_NODE);
    sideLines(side, tag, models, gates as Map<string, string>, lines);
  }
  lines.push(
    '',
    '.options reltol=1e-7 abstol=1e-15 vntol=1e-10',
    '.op',
    `.dc ${STAGE_INPUT_SOURCE} ${formatSpice(sweep.from)} ${formatSpice(sweep.to)} ${formatSpice(sweep.step)}`,
    // Batch mode runs no .dc without an output line (and its .op then lands at the sweep's start); a .control block replaces it.
    `.print dc v(${STAGE_INPUT_NODE}) v(${STAGE_OUTPUT_NODE})`,
    '.end',
    '',
  );
  return lines.join('\n');
}
