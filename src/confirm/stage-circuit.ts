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
/**
 * The holding loop's AC break (a stage with a gbw target): the loop senses the output through a series inductor
 * into a capacitor to ground, LOOP_L·LOOP_C = 1e9 s², a low-pass at 5 µHz. At DC the inductor is a short and the
 * capacitor open, so the operating point is the loop's exactly; from 1 Hz up the fed-back share is below 3e-11,
 * so the loop gain (at most LOOP_GAIN/LOOP_SCALE × the stage's gain) is far below 1 over the whole AC band.
 */
const LOOP_L = 1e9;
const LOOP_C = 1;

/** What the small-signal response of a stage needs: its load capacitance and the design-point output the loop holds. */
export interface StageAcSetup {
  cap: number;
  output: number;
}

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
 *
 * With `ac` (a gbw target) the circuit also carries the load capacitance on
 * the output, the loop's AC break (LOOP_L, LOOP_C), a zero-volt AC source in
 * series with the input gate, and a source `vset` (0 V on the sweep) that
 * moves the loop's aim to the design-point output for the AC analysis; the
 * AC vectors are v(out) and v(inp), whose ratio is the open-loop gain.
 */
export function stageCircuit(stage: StageResult, tag: string, vin0: number, models: { n: string; p: string }, ac?: StageAcSetup): BatchCircuit {
  const out = `out_${tag}`;
  const inp = `inp_${tag}`;
  const x = `x_${tag}`;
  const where = `confirm: stage "${stage.name}"`;
  const lines = [`* ---- gain stage "${stage.name}": ${stage.input.device}-input ${stage.input.topology}, ${stage.load.device}-type ${stage.load.topology} load; output held on the sweep by a bounded loop`];
  const xmax = LOOP_RANGE * LOOP_SCALE;
  const k = `${formatSpice(xmax)}*tanh(${formatSpice(LOOP_GAIN / xmax)}*`;
  if (!ac) {
    lines.push(`b_${tag}_x ${x} 0 v = ${k}(v(${out})-v(${SWEEP_NODE})))`);
    lines.push(`b_${tag}_in ${inp} 0 v = ${formatSpice(vin0)}+v(${x})/${LOOP_SCALE}`);
  } else {
    const fb = `fb_${tag}`;
    const set = `set_${tag}`;
    const drive = `inq_${tag}`;
    lines.push(
      `* the loop senses the output through ${formatSpice(LOOP_L)} H into ${formatSpice(LOOP_C)} F: the same DC point, no loop at AC`,
      `l_${tag}_fb ${out} ${fb} ${formatSpice(LOOP_L)}`,
      `c_${tag}_fb ${fb} 0 ${formatSpice(LOOP_C)}`,
      `vset_${tag} ${set} 0 dc 0`,
      `b_${tag}_x ${x} 0 v = ${k}(v(${fb})-v(${SWEEP_NODE})-v(${set})))`,
      `b_${tag}_in ${drive} 0 v = ${formatSpice(vin0)}+v(${x})/${LOOP_SCALE}`,
      `vac_${tag} ${inp} ${drive} dc 0 ac 1`,
      `c_${tag}_load ${out} 0 ${formatSpice(ac.cap)}`,
    );
  }
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
  const small = ac ? { set: [{ source: `vset_${tag}`, dc: ac.output }], vectors: [`v(${out})`, `v(${inp})`] } : undefined;
  return { tag, lines, vectors: [`v(${out})`, `v(${x})`], ...(small ? { ac: small } : {}) };
}
