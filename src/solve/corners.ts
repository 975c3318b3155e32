import { StackwrightError } from '../errors.js';
import type { StackSpec } from '../spec/types.js';
import { biasGates, type StackDevice } from '../stack/index.js';
import { cornerUt } from './temperature.js';
import type { CornerResult, StackResult } from './types.js';
import type { KitAccess } from './kit.js';
import { marginsOf } from './checks.js';
import { pelgromSigma } from './mismatch.js';
import { cornerResult } from './result.js';
import { evaluateStack, type StackEval } from './stackeval.js';
import { widthLimit } from './width.js';

/**
 * Re-check a sized design on any corner of any kit: the same W, L and bias
 * devices (same bias current) produce new gate voltages there (the mirror
 * tracks the corner) and the stack is re-evaluated with them. Throws kind
 * 'range' when the kit's tables do not cover the design's lengths or bias.
 */
export function evaluateAtCorner(result: StackResult, spec: StackSpec, kit: KitAccess, corner: string, supply: number): CornerResult {
  if (!kit.corners.includes(corner)) {
    throw new StackwrightError(`corner "${corner}" is not in kit ${kit.kit} (has ${kit.corners.join(', ')})`, { where: `stack "${result.name}"` });
  }
  if (result.devices.length === 0) throw new StackwrightError('the result has no sized devices to re-check', { where: `stack "${result.name}"` });
  const slices = result.devices.map((d) => kit.slice(corner, result.device, d.l));
  const biasSlices = result.bias.map((b) => kit.slice(corner, result.device, b.l));
  const gates = biasGates(result.bias, biasSlices);
  const devices: StackDevice[] = slices.map((slice, k) => ({ slice, w: result.devices[k].w }));
  const vmid = 0.5 * (spec.headroom + spec.span);
  const nodes = [0, ...result.devices.map((d) => d.vsb + d.vds)];
  const ev: StackEval | null = evaluateStack(devices, gates, spec, vmid, { i: spec.current, nodes }, undefined, cornerUt(kit, corner, result.device));
  const coeff = kit.mismatch(result.device);
  let sigma: number | undefined;
  if (coeff && ev) {
    const b = ev.mid.devices[0];
    sigma = pelgromSigma(b.gm / b.id, devices[0].w, devices[0].slice.l, coeff);
  }
  const margins = marginsOf({ ...spec, wmax: widthLimit(spec, kit.lengths(corner, result.device)[0]) }, ev, sigma);
  const area = result.devices.reduce((a, d) => a + d.w * d.l, 0);
  const biasArea = result.bias.reduce((a, b) => a + b.w * b.l, 0);
  return cornerResult(spec, corner, margins, ev, sigma, { area, biasArea, gates, supply });
}
