import { StackwrightError } from '../errors.js';
import { specDecimal } from '../units/index.js';
import type { StageSpec } from '../design/types.js';
import { biasGates, SWING_TOLERANCE, traceStage, type StackDevice, type StageCircuit } from '../stack/index.js';
import type { KitAccess } from './kit.js';
import { change, deviceChanges, type Change, type Harder } from './compare.js';
import { absolute } from './result.js';
import { TRACE_STEP, gbwOf } from './stage-eval.js';
import type { StageCorner, StageResult, StageSide, StageVerdict } from './stage-types.js';
import { vinMargin, vinRail } from './stage-rails.js';

/**
 * A stage spec on a kit with another supply: the design point and the swing
 * target keep their share of the supply (the output's distance to the rails
 * scales with it). The caller reports the change.
 */
export function retargetStage(s: StageSpec, from: number, to: number): StageSpec {
  if (from === to) return s;
  const k = to / from;
  return { ...s, output: specDecimal(s.output * k), swing: specDecimal(s.swing * k) };
}


/** Sizes, gates and predicted figures of two designs of one stage, side by side. */
export function compareStages(from: StageResult, to: StageResult): Change[] {
  const rows: Change[] = [];
  for (const side of ['input', 'load'] as const) {
    // Matched by role, as stacks are: a cascode load's top is a triple load's top; a role on
    // one side only is NaN on the other (shown as a dash).
    rows.push(...deviceChanges(from[side].devices, to[side].devices, `${side} `, false));
  }
  const p = from.predicted;
  const q = to.predicted;
  rows.push(change('gain', 'V/V', p.gain, q.gain));
  rows.push(change('swing', 'V', p.swing, q.swing));
  rows.push(change('input DC voltage', 'V', p.vin, q.vin));
  rows.push(change('area', 'm²', p.area, q.area));
  return rows;
}

/**
 * One target of a gain stage that got harder on the new kit, as data in SI units (sentences are made in src/report).
 * `gain` and `gbw`: margins predicted/required (×); `swing`: slack swing − required in V, each kit against its own
 * target (port rescales the swing target with the supply); `topology` is the load's.
 */
export type StageHarder =
  | { quantity: 'feasible'; from: boolean; to: boolean; binding: StageVerdict | null }
  | { quantity: 'gain'; required: number; from: number; to: number; fromMargin: number; toMargin: number }
  | { quantity: 'swing'; fromRequired: number; toRequired: number; from: number; to: number; fromSlack: number; toSlack: number }
  | { quantity: 'gbw'; required: number; from: number; to: number; fromMargin: number; toMargin: number }
  | Extract<Harder, { quantity: 'area' | 'topology' }>;

/**
 * Targets of a stage whose margin shrank on the new kit by more than the stage search's own tolerance (README,
 * tests/stage-optimal and stage-objectives: 5 % in gain and GBW, 10 mV in swing), and area growth above 1.2× as
 * a cost. `fromSpec` and `toSpec` are the stage as sized on each kit (port may have rescaled output and swing).
 */
export function harderStage(fromSpec: StageSpec, toSpec: StageSpec, from: StageResult, to: StageResult): StageHarder[] {
  const out: StageHarder[] = [];
  const p = from.predicted;
  const q = to.predicted;
  if (!to.feasible) out.push({ quantity: 'feasible', from: from.feasible, to: false, binding: to.binding ?? null });
  const fin = Number.isFinite;
  if (fin(p.gain) && fin(q.gain) && q.gain / toSpec.gain < (p.gain / fromSpec.gain) * 0.95) {
    out.push({ quantity: 'gain', required: toSpec.gain, from: p.gain, to: q.gain, fromMargin: p.gain / fromSpec.gain, toMargin: q.gain / toSpec.gain });
  }
  const fromSlack = p.swing - fromSpec.swing;
  const toSlack = q.swing - toSpec.swing;
  if (fin(fromSlack) && fin(toSlack) && toSlack < fromSlack - 0.01) {
    out.push({ quantity: 'swing', fromRequired: fromSpec.swing, toRequired: toSpec.swing, from: p.swing, to: q.swing, fromSlack, toSlack });
  }
  const g = toSpec.gbw;
  if (g !== undefined && fromSpec.gbw !== undefined && p.gbw !== null && q.gbw !== null && q.gbw / g < (p.gbw / fromSpec.gbw) * 0.95) {
    out.push({ quantity: 'gbw', required: g, from: p.gbw, to: q.gbw, fromMargin: p.gbw / fromSpec.gbw, toMargin: q.gbw / g });
  }
  if (p.area > 0 && q.area > p.area * 1.2) out.push({ quantity: 'area', from: p.area, to: q.area, ratio: q.area / p.area });
  if (from.load.topology !== to.load.topology) out.push({ quantity: 'topology', from: from.load.topology, to: to.load.topology });
  return out;
}

function devicesOn(kit: KitAccess, corner: string, side: StageSide): StackDevice[] {
  return side.devices.map((d) => ({ slice: kit.slice(corner, side.device, d.l), w: d.w }));
}

/**
 * The reported sizes as they are on a kit and corner: each fixed gate from its
 * bias diode there, the input DC voltage re-solved for the design point.
 * An error entry when the tables cannot hold a bias diode or device.
 */
export function stageAsIs(r: StageResult, spec: StageSpec, kit: KitAccess, corner: string, supply: number): StageCorner | { error: string } {
  if (r.input.devices.length === 0 || r.load.devices.length === 0) return { error: 'the stage has no sized devices' };
  try {
    const ig = biasGates(r.input.bias, r.input.bias.map((b) => kit.slice(corner, r.input.device, b.l)));
    const lg = biasGates(r.load.bias, r.load.bias.map((b) => kit.slice(corner, r.load.device, b.l)));
    const circuit: StageCircuit = {
      supply, device: r.input.device,
      input: { devices: devicesOn(kit, corner, r.input), cascodeGate: ig[0] },
      load: { devices: devicesOn(kit, corner, r.load), gates: lg },
    };
    const trace = traceStage(circuit, spec.output, spec.gain, { step: TRACE_STEP, swing: spec.swing });
    const p = trace.points[trace.j0];
    const gbw = p ? gbwOf(spec, p.gm, null) : null;
    const railsOk = !p || vinMargin(p.vin, supply) >= 0;
    const feasible = railsOk && trace.swing >= spec.swing - SWING_TOLERANCE && (spec.gbw === undefined || (gbw ?? 0) >= spec.gbw);
    const out: StageCorner = {
      corner, feasible,
      predicted: {
        gain: trace.gains[trace.j0], swing: trace.swing, vlow: trace.vlow, vhigh: trace.vhigh, output: spec.output,
        vin: p ? p.vin : 0, gbw, cout: null, area: r.predicted.area, current: p ? p.i : 0,
      },
      gates: { input: ig.map((g) => absolute(r.input.device, supply, g)), load: lg.map((g) => absolute(r.load.device, supply, g)) },
    };
    const verdict = { target: 'swing' as const, required: spec.swing, achieved: trace.swing, at: null, device: null, corner };
    if (feasible) out.tightest = verdict;
    else if (!railsOk && p) out.binding = { target: 'vin', required: vinRail(p.vin, supply), achieved: p.vin, at: spec.output, device: null, corner };
    else out.binding = trace.swing < spec.swing ? verdict : { target: 'gbw', required: spec.gbw ?? null, achieved: gbw, at: spec.output, device: null, corner };
    return out;
  } catch (e) {
    if (e instanceof StackwrightError && e.kind === 'range') return { error: e.message };
    throw e;
  }
}
