import { StackwrightError } from '../../errors.js';
import type { LengthSlice } from '../../device/types.js';
import type { StackSpec } from '../../design/types.js';
import { gmidAt, vgsWindow } from '../../stack/invert.js';

const um = (x: number) => `${Number((x * 1e6).toPrecision(3))} µm`;
const perVolt = (x: number): string => `${Number(x.toPrecision(3))} /V`;

/**
 * Channel lengths to try: the table lengths inside spec.l, or a grid with
 * spec.l.step (interpolated between table lengths), never outside the table.
 */
export function lengthGrid(spec: StackSpec, table: Float64Array, where: string): number[] {
  const all = Array.from(table);
  if (all.length === 0) throw new StackwrightError('the table has no channel lengths', { where });
  const lo = spec.l?.min ?? all[0];
  const hi = spec.l?.max ?? all[all.length - 1];
  const eps = 1e-12;
  if (hi < all[0] - eps || lo > all[all.length - 1] + eps) {
    throw new StackwrightError(`L range ${um(lo)}..${um(hi)} is outside the table (${um(all[0])}..${um(all[all.length - 1])})`, { where: `${where}.l` });
  }
  let out: number[];
  if (spec.l?.step) {
    const from = Math.max(lo, all[0]);
    const to = Math.min(hi, all[all.length - 1]);
    const n = Math.floor((to - from) / spec.l.step + 1e-9);
    if (n > 400) throw new StackwrightError(`L step ${um(spec.l.step)} gives ${n + 1} lengths; use a coarser step`, { where: `${where}.l.step` });
    out = Array.from({ length: n + 1 }, (_, j) => from + j * spec.l!.step!);
  } else {
    out = all.filter((l) => l >= lo * (1 - 1e-9) && l <= hi * (1 + 1e-9));
  }
  if (out.length === 0) {
    throw new StackwrightError(`no table length lies in ${um(lo)}..${um(hi)} (table has ${all.map(um).join(', ')}); add a step to interpolate`, { where: `${where}.l` });
  }
  return out;
}

const GMID_POINTS = 12;
const GMID_FLOOR = 3;
// Square-law-like tables have unbounded gm/ID near threshold; beyond this W explodes anyway.
const GMID_CEILING = 30;
// Share of the weak-inversion ceiling the grid reaches: the last percent is where
// saturated low-mismatch designs live (W grows fast there, the objective weighs it).
const REACH_SHARE = 0.99;

/** Highest gm/ID the slices reach at VSB = 0 (sampled over VGS). */
export function gmidReach(slices: readonly LengthSlice[], vds: number): number {
  let best = 0;
  for (const s of slices) {
    const v = Math.min(Math.max(vds, s.range.vds[0]), s.range.vds[1]);
    const win = vgsWindow(s, v, 0);
    if (!win) continue;
    for (let j = 0; j <= 64; j++) {
      const g = gmidAt(s, win[0] + ((win[1] - win[0]) * j) / 64, v, 0);
      if (Number.isFinite(g) && g > best) best = g;
    }
  }
  return best;
}

/** gm/ID grid: from ~3 /V (or spec.gmid.min) up to what the table reaches (or spec.gmid.max). */
export function gmidGrid(spec: StackSpec, slices: readonly LengthSlice[], vmid: number, where: string): { values: number[]; step: number } {
  const reach = Math.min(REACH_SHARE * gmidReach(slices, 0.5 * vmid), GMID_CEILING);
  const lo = spec.gmid?.min ?? GMID_FLOOR;
  const hi = Math.min(spec.gmid?.max ?? Infinity, reach);
  if (!(hi > lo)) {
    throw new StackwrightError(`gm/ID range ${perVolt(lo)}..${perVolt(spec.gmid?.max ?? reach)} is beyond what the table reaches (up to ${perVolt(reach)})`, { where: `${where}.gmid` });
  }
  const step = (hi - lo) / (GMID_POINTS - 1);
  return { values: Array.from({ length: GMID_POINTS }, (_, j) => lo + j * step), step };
}

/** VDS setpoint grid for the lower devices, from 50 mV in `step` increments up to what the headroom target allows. */
export function setpointGrid(spec: StackSpec, vmid: number, step: number): number[] {
  const top = Math.min(vmid - 0.15, Math.max(spec.headroom - 0.05, 0.15));
  const out: number[] = [];
  for (let s = 0.05; s <= top + 1e-9; s += step) out.push(Math.round(s * 1e6) / 1e6);
  return out;
}
