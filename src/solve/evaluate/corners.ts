import { StackwrightError } from '../../errors.js';
import type { StackSpec } from '../../design/types.js';
import { cornerUt } from './temperature.js';
import type { CornerResult, StackResult } from '../types.js';
import type { KitAccess } from '../kit.js';
import { cornerResult } from '../result.js';
import { evaluateAt } from './evaluate.js';
import { CURVE_INTERVALS } from './stack-eval.js';
import { midSpan } from '../../policy.js';
import { widthLimit } from '../width.js';

/**
 * Re-check a sized design on any corner of any kit: the same W, L and bias
 * devices (same bias current) produce new gate voltages there (the mirror
 * tracks the corner) and the stack is re-evaluated with them, by the same
 * evaluation the search uses. Throws kind 'range' when the kit's tables do not
 * cover the design's lengths.
 */
export function evaluateAtCorner(result: StackResult, spec: StackSpec, kit: KitAccess, corner: string, supply: number): CornerResult {
  if (!kit.corners.includes(corner)) {
    throw new StackwrightError(`corner "${corner}" is not in kit ${kit.kit} (has ${kit.corners.join(', ')})`, { where: `stack "${result.name}"` });
  }
  if (result.devices.length === 0) throw new StackwrightError('the result has no sized devices to re-check', { where: `stack "${result.name}"` });
  const vmid = midSpan(spec);
  const c = evaluateAt({
    spec: { ...spec, wmax: widthLimit(spec, kit.lengths(corner, result.device)[0]) }, corner,
    devices: result.devices.map((d) => ({ slice: kit.slice(corner, result.device, d.l), w: d.w })),
    bias: result.bias, biasSlices: result.bias.map((b) => kit.slice(corner, result.device, b.l)),
    guess: { i: spec.current, nodes: [0, ...result.devices.map((d) => d.vsb + d.vds)] },
    vmid, ut: cornerUt(kit, corner, result.device), intervals: CURVE_INTERVALS, coeff: kit.mismatch(result.device),
  });
  const area = result.devices.reduce((a, d) => a + d.w * d.l, 0);
  const biasArea = result.bias.reduce((a, b) => a + b.w * b.l, 0);
  return cornerResult(spec, corner, c.margins, c.ev, c.sigma, { area, biasArea, gates: c.gates, supply, vmid });
}
