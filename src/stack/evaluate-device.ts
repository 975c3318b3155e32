import type { DeviceBias, StackDevice } from './types.js';
import { covers } from './range.js';

const scratch = new Float64Array(4);

/**
 * Small-signal values of one stack device at its width, written into `out`.
 * Returns false (and leaves `out` alone) when the bias is outside the table.
 */
export function evalDevice(d: StackDevice, vgs: number, vds: number, vsb: number, out: DeviceBias): boolean {
  if (!covers(d.slice, vgs, vds, vsb)) return false;
  const s = d.slice.small(vgs, vds, vsb, scratch);
  out.vgs = vgs;
  out.vds = vds;
  out.vsb = vsb;
  out.id = s[0] * d.w;
  out.gm = s[1] * d.w;
  out.gds = s[2] * d.w;
  out.gmb = s[3] * d.w;
  return true;
}

export function emptyBias(): DeviceBias {
  return { vgs: 0, vds: 0, vsb: 0, id: 0, gm: 0, gds: 0, gmb: 0 };
}
