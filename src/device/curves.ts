import { sliceAt } from './slice.js';
import { defaultVds } from './probe.js';
import type { DeviceTable } from '../table/types.js';

/** One point of a design curve at fixed L, VDS, VSB (SI; ft NaN or absent without capacitances). */
export interface DesignPoint {
  vgs: number;
  gmid: number;
  gain: number;
  jd: number;
  ft?: number;
}

export interface DesignCurve {
  l: number;
  points: DesignPoint[];
}

export interface CurveOptions {
  /** Default: middle of the vds axis. */
  vds?: number;
  /** Default 0. */
  vsb?: number;
  /** Default: the table's lengths. */
  lengths?: readonly number[];
  /**
   * Points with jd at or below this (A/m) are dropped; default 1e-9 of the curve's
   * largest jd, where gm/ID is leakage and noise rather than the device.
   */
  floor?: number;
}

/**
 * Per length, {vgs, gmid, gain, jd, ft} at each VGS of the table, for charts of
 * gm/gds, ID/W and fT against gm/ID (one curve per length).
 */
export function designCurves(table: DeviceTable, opts: CurveOptions = {}): DesignCurve[] {
  const vds = opts.vds ?? defaultVds(table);
  const vsb = opts.vsb ?? 0;
  const lengths = opts.lengths ?? Array.from(table.axes.l);
  const w = table.meta.referenceWidth;
  return lengths.map((l) => {
    const slice = sliceAt(table, l);
    const all = Array.from(table.axes.vgs, (vgs) => {
      const op = slice.op(vgs, vds, vsb, w);
      return { vgs, gmid: op.gmid, gain: op.gain, jd: op.jd, ft: op.ft };
    });
    const top = all.reduce((m, p) => Math.max(m, p.jd), 0);
    const floor = opts.floor ?? 1e-9 * top;
    return { l, points: all.filter((p) => p.jd > floor && p.jd > 0) };
  });
}
