import type { DeviceBias, StackOp } from './types.js';
import { PackedOp, packedRout } from './packed-op.js';

/**
 * Small-signal resistance looking into the top of the chain, gates and rail at
 * AC ground. KCL at each node with a 1 A test current gives the forward
 * recurrence v_k = v_{k−1} + (1 + (gm_k + gmb_k)·v_{k−1}) / gds_k (the
 * bidiagonal nodal system solved by substitution); Rout = v_N.
 * For two devices this is ro1 + ro2 + (gm2 + gmb2)·ro1·ro2.
 */
export function routOf(devices: readonly Pick<DeviceBias, 'gm' | 'gds' | 'gmb'>[]): number {
  let vs = 0;
  // Indexed: a for-of allocates an iterator wherever this runs unoptimised.
  for (let k = 0; k < devices.length; k++) {
    const d = devices[k];
    if (!(d.gds > 0)) return Infinity;
    vs += (1 + (d.gm + d.gmb) * vs) / d.gds;
  }
  return vs;
}

/** Rout at a solved operating point. */
export function routAt(op: StackOp): number {
  return op instanceof PackedOp ? packedRout(op) : routOf(op.devices);
}
