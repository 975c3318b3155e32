import { StackwrightError } from '../errors.js';
import type { LengthSlice } from '../device/types.js';
import type { StackShape } from './types.js';
import { vgsForGmid } from './invert.js';
import { doubles } from './doubles.js';

/** The design variables of one stack. */
export interface StackDesign {
  /** The topology's stack shape. */
  shape: StackShape;
  /** One slice per device, from the rail outwards. */
  slices: readonly LengthSlice[];
  /** gm/ID of each device at its design bias, 1/V. */
  gmid: readonly number[];
  /** VDS setpoints of the lower devices (cascode: 1, triple: 2, else none), V. */
  setpoints: readonly number[];
  /** Design current, A. */
  current: number;
  /** Mid-span stack voltage where the design bias holds, V. */
  vmid: number;
  /** Narrowest drawable width, m: narrower devices make the design unrealisable. */
  wmin?: number;
}

/** Widths, gate voltages (stack coordinates) and design-bias nodes of a stack (each VGS is its gate less its source node). */
export interface SizedStack {
  w: number[];
  gates: number[];
  /** Node voltages x_0..x_N at v = vmid. */
  nodes: number[];
}

/**
 * Size a stack from its design variables: each device sits at its design
 * bias at v = vmid, VGS follows from gm/ID there, W = I / jd, and the gate is
 * VGS plus the source node. Low-voltage biasing puts the lower drains at the
 * setpoints; a bottom diode has VDS1 = VGS1 (its bias diode sets x1).
 * Returns null when the table cannot reach a device's gm/ID at its bias, or a
 * device would be narrower than `wmin`.
 */
export function sizeStackDevices(d: StackDesign): SizedStack | null {
  const n = d.slices.length;
  if (d.gmid.length !== n) throw new StackwrightError(`need one gm/ID per device (${n}), got ${d.gmid.length}`, { kind: 'internal' });
  if (d.setpoints.length !== d.shape.setpoints) {
    throw new StackwrightError(`${d.shape.name} takes ${d.shape.setpoints} VDS setpoints, got ${d.setpoints.length}`, { kind: 'internal' });
  }
  // Arrays of exactly their length, stored unboxed (designs keep them).
  const nodes = doubles(n + 1);
  nodes[0] = 0;
  const gates = doubles(n);
  const w = doubles(n);
  for (let k = 0; k < n; k++) {
    const xs = nodes[k];
    let g: number | null;
    let vds: number;
    if (d.shape.bottomDiode && k === 0) {
      g = vgsForGmid(d.slices[0], d.gmid[0], 'diode', 0);
      vds = g ?? NaN;
    } else {
      vds = k < n - 1 ? d.setpoints[k] : d.vmid - xs;
      if (!(vds > 0)) return null;
      g = vgsForGmid(d.slices[k], d.gmid[k], vds, xs);
    }
    if (g === null) return null;
    const jd = d.slices[k].jd(g, vds, xs);
    if (!(jd > 0)) return null;
    const width = d.current / jd;
    if (d.wmin !== undefined && width < d.wmin * (1 - 1e-9)) return null;
    gates[k] = g + xs;
    w[k] = width;
    nodes[k + 1] = xs + vds;
  }
  if (Math.abs(nodes[n] - d.vmid) > 1e-9) return null;
  return { w, gates, nodes };
}
