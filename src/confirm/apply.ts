import type { StackResult } from '../solve/types.js';
import type { Confirmation } from './types.js';

/** The stack result with the sizes simulation confirmed (for netlists): corrected widths, gates and bias devices. */
export function withCorrection(stack: StackResult, c: Confirmation | undefined): StackResult {
  const k = c?.corrected;
  if (!k) return stack;
  return {
    ...stack,
    devices: stack.devices.map((d, i) => ({ ...d, w: k.devices[i]?.w ?? d.w, gate: k.devices[i]?.gate ?? d.gate })),
    bias: k.bias,
  };
}
