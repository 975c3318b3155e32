import type { StageResult, StageSide } from '../solve/stage-types.js';

/**
 * The handles stage correction turns, as natural-log width factors:
 *  - `inputSetpoint` / `loadSetpoint`: the width of the bias diode driving a
 *    side's top (cascode) gate: a wider diode gives a gate nearer its rail, so
 *    the devices below get less VDS; the side's saturation edge, and with it
 *    that end of the swing, steps toward the rail (and the lower device's Rout down);
 *  - `inputTop` / `loadTop`: the width of a side's top (cascode) device: at its
 *    fixed gate it sits at a lower overdrive, more gm/ID and intrinsic gain,
 *    so that side's Rout and the gain rise (area too).
 *  - `inputWidth`: the input device's width: with the output held, the current
 *    stays the load's, so the input device sits at a lower overdrive: less
 *    VDSsat (the input side's end of the swing moves out) and more gm (gain);
 *  - `loadWidth`: every load device and its bias diodes together: same
 *    current, lower overdrive, less VDSsat at the load side's end.
 * A side without a cascode has no setpoint or top knob.
 */
export type StageKnob = 'inputSetpoint' | 'loadSetpoint' | 'inputTop' | 'loadTop' | 'inputWidth' | 'loadWidth';

const sideOf = (knob: StageKnob): 'input' | 'load' => (knob.startsWith('input') ? 'input' : 'load');

/** Knobs this stage has (sides with a cascode device and its bias diode). */
export function stageKnobs(stage: StageResult): StageKnob[] {
  const out: StageKnob[] = ['inputWidth', 'loadWidth'];
  for (const kind of ['input', 'load'] as const) {
    const side = stage[kind];
    if (side.devices.length < 2) continue;
    if (topDiode(side) >= 0) out.push(`${kind}Setpoint`);
    out.push(`${kind}Top`);
  }
  return out;
}

function topDiode(side: StageSide): number {
  const top = side.devices[side.devices.length - 1].role;
  return side.bias.findIndex((b) => b.drives === top);
}

function copySide(side: StageSide): StageSide {
  return { ...side, devices: side.devices.map((d) => ({ ...d })), bias: side.bias.map((b) => ({ ...b })) };
}

/** The stage with one knob turned by `x` (ln of the width factor). */
export function turnStage(stage: StageResult, knob: StageKnob, x: number): StageResult {
  if (x === 0) return stage;
  const kind = sideOf(knob);
  const side = copySide(stage[kind]);
  const f = Math.exp(x);
  if (knob === 'inputWidth') side.devices[0].w *= f;
  else if (knob === 'loadWidth') {
    for (const d of side.devices) d.w *= f;
    for (const b of side.bias) b.w *= f;
  } else if (knob.endsWith('Setpoint')) {
    const k = topDiode(side);
    if (k >= 0) side.bias[k].w *= f;
  } else side.devices[side.devices.length - 1].w *= f;
  return { ...stage, [kind]: side };
}

/** ΣW·L of both sides' output devices, m². */
export function stageArea(stage: StageResult): number {
  return [...stage.input.devices, ...stage.load.devices].reduce((a, d) => a + d.w * d.l, 0);
}

/** Every width of the stage, output devices and bias diodes of both sides, times e^x: same currents, less area. */
export function scaleStage(stage: StageResult, x: number): StageResult {
  if (x === 0) return stage;
  const f = Math.exp(x);
  const side = (s: StageSide): StageSide => ({ ...s, devices: s.devices.map((d) => ({ ...d, w: d.w * f })), bias: s.bias.map((b) => ({ ...b, w: b.w * f })) });
  return { ...stage, input: side(stage.input), load: side(stage.load) };
}
