import type { StackResult } from '../solve/types.js';
import type { StageResult, StageSide } from '../solve/stage-types.js';
import type { CorrectedSide, StageConfirmation } from './stage-types.js';
import type { Confirmation } from './types.js';

/** The stack result with the sizes simulation confirmed (for netlists): corrected widths, gates and bias devices, and the tables' prediction for them. */
export function withCorrection(stack: StackResult, c: Pick<Confirmation, 'corrected'> | undefined): StackResult {
  const k = c?.corrected;
  if (!k) return stack;
  return {
    ...stack,
    devices: stack.devices.map((d, i) => ({ ...d, w: k.devices[i]?.w ?? d.w, gate: k.devices[i]?.gate ?? d.gate })),
    bias: k.bias,
    predicted: { ...stack.predicted, ...k.predicted, area: k.area },
  };
}

/** The stage result with the widths simulation confirmed (for netlists): corrected output devices and bias diodes of both sides. */
export function withStageCorrection(stage: StageResult, c: Pick<StageConfirmation, 'corrected'> | undefined): StageResult {
  const k = c?.corrected;
  if (!k) return stage;
  const side = (s: StageSide, ks: CorrectedSide): StageSide => ({ ...s, devices: s.devices.map((d, i) => ({ ...d, w: ks.devices[i]?.w ?? d.w })), bias: ks.bias });
  return { ...stage, input: side(stage.input, k.input), load: side(stage.load, k.load) };
}
