import { StackwrightError } from '../errors.js';
import { tableLabel } from '../table/label.js';
import type { DeviceTable } from '../table/types.js';
import { formatEng } from '../units/index.js';
import { solveBracket } from '../numeric/bracket.js';
import { sliceAt, TableSlice } from './slice.js';
import type { LengthSlice, OperatingPoint } from './types.js';

export type VgsTarget = { gmid: number; jd?: undefined } | { jd: number; gmid?: undefined };

/** Nodes searched along VGS: the table's own VGS points, or a fine even grid for other slices. */
function vgsNodes(slice: LengthSlice): ArrayLike<number> {
  if (slice instanceof TableSlice) return slice.table.axes.vgs;
  const [lo, hi] = slice.range.vgs;
  return Array.from({ length: 201 }, (_, k) => lo + ((hi - lo) * k) / 200);
}

function describe(slice: LengthSlice, vds: number, vsb: number): string {
  const name = slice instanceof TableSlice ? `${tableLabel(slice.table.meta)} ` : '';
  return `${name}at l = ${formatEng(slice.l, 'm', 4)}, vds = ${formatEng(vds, 'V', 4)}, vsb = ${formatEng(vsb, 'V', 4)}`;
}

/**
 * VGS at which the slice reaches a gm/ID or a current density, at fixed (vds, vsb).
 *
 * gm/ID falls with VGS, except that it is nearly flat on the weak-inversion plateau
 * and can dip at the lowest VGS where leakage or noise dominates. We invert on the
 * monotone envelope from the peak: the VGS nodes from the highest gm/ID onwards,
 * taking the first VGS above the peak where gm/ID comes down to the target. So on a
 * plateau (several VGS giving about the same gm/ID) the lowest-current solution is
 * always the one chosen; the rising part below the peak is never used.
 * Reachable gm/ID is [lowest value after the peak, the peak]; outside → kind 'range'.
 *
 * jd rises with VGS; likewise the first (lowest-VGS) crossing is taken, and a target
 * outside [jd at the lowest VGS, highest jd] is a range error.
 * Between two nodes the crossing is solved on the slice's own interpolation.
 */
export function vgsFor(slice: LengthSlice, target: VgsTarget, vds: number, vsb: number): number {
  const byGmid = target.gmid !== undefined;
  const x = byGmid ? target.gmid : (target.jd as number);
  const name = byGmid ? 'gmid' : 'jd';
  // gm/ID prints plainly: a prefix on "1/V" reads badly.
  const show = (v: number): string => (byGmid ? `${Number(v.toPrecision(4))} 1/V` : formatEng(v, 'A/m', 4));
  if (!(Number.isFinite(x) && x > 0)) {
    throw new StackwrightError(`${name} target must be a positive number, got ${x}`);
  }
  const nodes = vgsNodes(slice);
  const n = nodes.length;
  const buf = new Float64Array(4);
  const val = (v: number): number => {
    const s = slice.small(v, vds, vsb, buf);
    return byGmid ? (s[0] > 0 ? s[1] / s[0] : NaN) : s[0];
  };
  const y = new Float64Array(n);
  for (let k = 0; k < n; k++) y[k] = val(nodes[k]);

  let start = -1;
  if (byGmid) {
    for (let k = 0; k < n; k++) if (Number.isFinite(y[k]) && (start < 0 || y[k] > y[start])) start = k;
  } else {
    start = 0;
  }
  if (start < 0) throw new StackwrightError(`no positive drain current ${describe(slice, vds, vsb)}`, { kind: 'range' });

  // Envelope from `start`: gm/ID running minimum, jd running maximum.
  let lo = y[start];
  let hi = y[start];
  for (let k = start + 1; k < n; k++) {
    if (!Number.isFinite(y[k])) continue;
    lo = Math.min(lo, y[k]);
    hi = Math.max(hi, y[k]);
  }
  const reach = `reachable ${name} ${describe(slice, vds, vsb)} is ${show(lo)} to ${show(hi)}`;
  const slack = 1e-12 * Math.abs(hi);
  if (x > hi + slack) {
    throw new StackwrightError(`${name} = ${show(x)} is above what the table reaches; ${reach}`, { kind: 'range' });
  }
  if (x < lo - slack) {
    throw new StackwrightError(`${name} = ${show(x)} is below what the table reaches; ${reach}`, { kind: 'range' });
  }
  const passed = (v: number): boolean => (byGmid ? v <= x : v >= x);
  if (byGmid ? x >= y[start] : x <= y[start]) return nodes[start];
  let prev = start;
  for (let k = start + 1; k < n; k++) {
    if (!Number.isFinite(y[k])) continue;
    if (passed(y[k])) {
      if (y[k] === x) return nodes[k];
      const f = (v: number): number => {
        const g = val(v);
        return Number.isFinite(g) ? (g - x) / x : byGmid ? 1 : -1;
      };
      return solveBracket(f, nodes[prev], nodes[k], (y[prev] - x) / x, (y[k] - x) / x);
    }
    prev = k;
  }
  // Only reachable through the slack at the far end.
  return nodes[prev];
}

export interface ProbeQuery {
  /** Channel length, m. */
  l: number;
  vgs?: number;
  gmid?: number;
  jd?: number;
  /** Default: the middle of the table's vds range. */
  vds?: number;
  /** Default 0. */
  vsb?: number;
  /** Default: the table's reference width. */
  w?: number;
}

export interface ProbeResult extends OperatingPoint {
  /** Which quantity fixed the bias. */
  by: 'vgs' | 'gmid' | 'jd';
}

/** Middle of the table's vds axis, the probe's default drain-source voltage. */
export function defaultVds(table: DeviceTable): number {
  const v = table.axes.vds;
  return 0.5 * (v[0] + v[v.length - 1]);
}

/**
 * Operating point of one device given exactly one of vgs, gmid or jd (VGS found by
 * `vgsFor` in the latter cases). Defaults: vds mid-axis, vsb = 0, w = reference width.
 */
export function probe(table: DeviceTable, q: ProbeQuery): ProbeResult {
  const given = (['vgs', 'gmid', 'jd'] as const).filter((k) => q[k] !== undefined);
  if (given.length !== 1) {
    throw new StackwrightError(`give exactly one of vgs, gmid, jd (got ${given.length ? given.join(', ') : 'none'})`);
  }
  const w = q.w ?? table.meta.referenceWidth;
  if (!(Number.isFinite(w) && w > 0)) throw new StackwrightError(`w must be a positive width in metres, got ${w}`);
  const vds = q.vds ?? defaultVds(table);
  const vsb = q.vsb ?? 0;
  const slice = sliceAt(table, q.l);
  const by = given[0];
  const vgs = by === 'vgs' ? (q.vgs as number)
    : by === 'gmid' ? vgsFor(slice, { gmid: q.gmid as number }, vds, vsb)
      : vgsFor(slice, { jd: q.jd as number }, vds, vsb);
  return { ...slice.op(vgs, vds, vsb, w), by };
}
