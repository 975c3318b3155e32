import { StackwrightError } from '../errors.js';
import type { OpGuess, StackDevice, StackOp } from './types.js';
import { packedOperatingPoint } from './packed-op.js';
import { newtonStart } from './newton.js';
import { emptyBias, evalDevice } from './evaluate-device.js';
import { outsideSlice } from './range.js';
import { formatEng } from '../units/index.js';

/**
 * DC operating point of a stack at stack voltage `v` with fixed gate voltages
 * (stack coordinates). One current flows; device k has source nodes[k-1],
 * drain nodes[k], VSB = nodes[k-1]. Newton from `guess` first, bracketed
 * bisection when that fails. Throws kind 'range' when the table cannot cover v.
 *
 * @example solveOperatingPoint([{ slice, w: 2e-6 }], [0.65], 0.9).i
 */
export function solveOperatingPoint(devices: readonly StackDevice[], gates: readonly number[], v: number, guess?: OpGuess): StackOp {
  if (devices.length === 0 || devices.length !== gates.length) {
    throw new StackwrightError(`stack needs one gate voltage per device (got ${devices.length} devices, ${gates.length} gates)`, { kind: 'internal' });
  }
  if (!(v >= 0) || !Number.isFinite(v)) throw new StackwrightError(`stack voltage must be ≥ 0 V, got ${Number.isFinite(v) ? formatEng(v, 'V', 4) : 'a value that is not a finite number'}`, { kind: 'input' });
  if (devices.length === 1) return singleDevice(devices[0], gates[0], v);
  // Newton, else the bracketed solve; the answer packed (its device values are read where they are kept).
  // One call for both (a call site first reached after optimisation deopts).
  const start = newtonStart(devices.length);
  const count = guess ? Math.min(guess.nodes.length, start.length) : 0;
  for (let k = 0; k < count; k++) start[k] = guess!.nodes[k];
  return packedOperatingPoint(devices, gates, v, guess ? guess.i : 0, count);
}

// One device: no unknown node, the table gives the current directly.
function singleDevice(d: StackDevice, gate: number, v: number): StackOp {
  const b = emptyBias();
  if (!evalDevice(d, gate, v, 0, b)) throw outsideSlice(d.slice, gate, v, 0, 'device 1');
  return { v, i: b.id, nodes: [0, v], devices: [b] };
}
