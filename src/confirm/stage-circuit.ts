import { formatSpice } from '../units/index.js';
import type { StageResult, StageSide } from '../solve/stage-types.js';
import { SWEEP_NODE, gateNodes } from '../spice/netlist.js';
import type { BatchCircuit } from './batch.js';

/** Input excursion the holding loop may apply around the predicted input voltage, V. */
export const LOOP_RANGE = 0.3;
/** Node `x` carries LOOP_SCALE·(vin − vin0): Δvin is read from a node of volts, not from a difference of two near-equal input voltages. */
export const LOOP_SCALE = 1000;
/** Transconductance of the loop from output error to x (V/V); loop gain = LOOP_GAIN/LOOP_SCALE × the stage's gain. */
const LOOP_GAIN = 1e5;

// One side's devices in series from its rail to the output node.
function sideLines(side: StageSide, tag: string, out: string, model: string, gates: Map<string, string>, lines: string[]): void {
  const p = side.device === 'p';
  const rail = p ? 'vdd' : '0';
  let below = rail;
  side.devices.forEach((d, k) => {
    const drain = k === side.devices.length - 1 ? out : `${tag}${k + 1}`;
    lines.push(`m_${tag}_${d.role} ${drain} ${gates.get(d.role)} ${below} ${rail} ${model} W=${formatSpice(d.w)} L=${formatSpice(d.l)}`);
    below = drain;
  });
}

/**
 * A gain stage as one circuit of a batched deck: both sides with their bias
 * diodes fed by the bias current (as `netlist --stage --bias diodes`), every
 * gate but the input fixed. The input is the DC source the transfer curve
 * needs, set by a bounded high-gain loop so that the output follows the shared
 * sweep node: each point of the sweep is a DC point (vin, vout) of the
 * open-loop transfer curve, sampled evenly in vout (where the swing is
 * measured), and the gain is |dvout/dvin| between neighbouring points. The
 * stage inverts for either input type, so the loop raises vin when the output
 * is too high. Vectors: v(out), x = LOOP_SCALE·(vin − vin0).
 */
export function stageCircuit(stage: StageResult, tag: string, vin0: number, models: { n: string; p: string }): BatchCircuit {
  const out = `out_${tag}`;
  const inp = `inp_${tag}`;
  const x = `x_${tag}`;
  const where = `confirm: stage "${stage.name}"`;
  const lines = [`* ---- gain stage "${stage.name}": ${stage.input.device}-input ${stage.input.topology}, ${stage.load.device}-type ${stage.load.topology} load; output held on the sweep by a bounded loop`];
  const xmax = LOOP_RANGE * LOOP_SCALE;
  lines.push(`b_${tag}_x ${x} 0 v = ${formatSpice(xmax)}*tanh(${formatSpice(LOOP_GAIN / xmax)}*(v(${out})-v(${SWEEP_NODE})))`);
  lines.push(`b_${tag}_in ${inp} 0 v = ${formatSpice(vin0)}+v(${x})/${LOOP_SCALE}`);
  for (const [side, t] of [[stage.load, `${tag}l`], [stage.input, `${tag}i`]] as const) {
    const p = side.device === 'p';
    const model = p ? models.p : models.n;
    const fixed = side === stage.input ? side.devices.slice(1) : side.devices;
    const gates = fixed.length
      ? gateNodes({ devices: fixed, bias: side.bias }, t, { supply: 0, bias: 'diodes' }, p ? 'vdd' : '0', model, p, where, lines)
      : new Map();
    if (side === stage.input) gates.set(side.devices[0].role, inp);
    sideLines(side, t, out, model, gates as Map<string, string>, lines);
  }
  return { tag, lines, vectors: [`v(${out})`, `v(${x})`] };
}
