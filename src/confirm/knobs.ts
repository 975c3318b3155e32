import type { StackResult } from '../solve/types.js';

/**
 * The continuous handles correction turns, as natural-log scale factors of widths:
 *  - `current`: every output-stack width (at fixed gates the current scales with W, nothing else moves);
 *  - `headroom`: the width of the bias diode that drives the top gate (a wider diode gives a lower gate,
 *    so the lower devices' VDS setpoint steps down and headroom with it); a single device has no
 *    setpoint, so there it is the device and its diode together (a lower gm/ID point, same current);
 *  - `top`: the top output device's width: at its fixed gate a wider top device sits at a lower VGS, which
 *    gives the devices below more VDS and raises its own gm/ID and intrinsic gain, so Rout rises (area too);
 *  - `shrink`: every width, output and bias, together: same current, higher current density, less area.
 */
export type Knob = 'current' | 'headroom' | 'top' | 'shrink';

function scaled<T extends { w: number }>(xs: readonly T[], pick: (x: T, k: number) => boolean, f: number): T[] {
  return xs.map((x, k) => (pick(x, k) ? { ...x, w: x.w * f } : { ...x }));
}

/** The design with one knob turned by `x` (ln of the width factor). */
export function turn(design: StackResult, knob: Knob, x: number): StackResult {
  if (x === 0) return design;
  const f = Math.exp(x);
  const all = () => true;
  if (knob === 'current') return { ...design, devices: scaled(design.devices, all, f), bias: design.bias.map((b) => ({ ...b })) };
  if (knob === 'top') {
    const last = design.devices.length - 1;
    return { ...design, devices: scaled(design.devices, (_, k) => k === last, f), bias: design.bias.map((b) => ({ ...b })) };
  }
  if (knob === 'shrink') return { ...design, devices: scaled(design.devices, all, f), bias: scaled(design.bias, all, f) };
  if (design.devices.length === 1) return { ...design, devices: scaled(design.devices, all, f), bias: scaled(design.bias, all, f) };
  const top = design.bias.findIndex((b) => b.drives === 'top');
  return { ...design, devices: design.devices.map((d) => ({ ...d })), bias: scaled(design.bias, (_, k) => k === top, f) };
}

/** Turn several knobs at once. */
export function turnAll(design: StackResult, moves: Partial<Record<Knob, number>>): StackResult {
  let d = design;
  for (const [k, x] of Object.entries(moves) as Array<[Knob, number]>) d = turn(d, k, x);
  return d;
}
