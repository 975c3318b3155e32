import { AxisLocator } from '../numeric/axis.js';
import { rangeError } from '../numeric/range-error.js';
import { tableLabel } from '../table/label.js';
import { STORED } from '../table/types.js';
import type { DeviceTable, StoredQuantity } from '../table/types.js';
import { nodeDerivative } from '../numeric/difference.js';

/** Quantities that vary exponentially in weak inversion, so are interpolated geometrically along VGS. */
export const LOG_ALONG_VGS: ReadonlySet<StoredQuantity> = new Set(['id', 'gm', 'gds', 'gmb']);

/** One channel length's values over (vgs, vds, vsb), row-major, at the table's reference width. */
export interface LengthPlane {
  l: number;
  dims: readonly [number, number, number];
  q: Partial<Record<StoredQuantity, Float64Array>> & { id: Float64Array };
  /** Conductances the table lacked and how they were estimated here. */
  estimated: Partial<Record<StoredQuantity, string>>;
}

/**
 * The plane at length `l`. At a table length it is a view of the stored data;
 * between two lengths l0 < l < l1 each node is merged once, log–log:
 * ln v = (1−s)·ln v0 + s·ln v1 with s = ln(l/l0)/ln(l1/l0), since currents,
 * conductances and capacitances follow power laws in L (the result stays between
 * the neighbours). Where a neighbour is ≤ 0 the log is undefined and the node is
 * linear in ln L instead.
 */
export function lengthPlane(table: DeviceTable, l: number): LengthPlane {
  const { axes } = table;
  const loc = new AxisLocator(axes.l);
  const il = loc.locate(l);
  if (il < 0) throw rangeError('l', l, loc.lo, loc.hi, 'm', tableLabel(table.meta));
  const dims = [axes.vgs.length, axes.vds.length, axes.vsb.length] as const;
  const m = dims[0] * dims[1] * dims[2];
  const t = loc.t;
  const node = t === 0 ? il : t === 1 ? il + 1 : -1;
  const q: Partial<Record<StoredQuantity, Float64Array>> = {};
  const s = node < 0 ? Math.log(l / axes.l[il]) / Math.log(axes.l[il + 1] / axes.l[il]) : 0;
  for (const name of STORED) {
    const src = table.data[name];
    if (!src) continue;
    if (node >= 0) {
      q[name] = src.subarray(node * m, (node + 1) * m);
      continue;
    }
    const out = new Float64Array(m);
    const a0 = il * m;
    const b0 = (il + 1) * m;
    for (let k = 0; k < m; k++) {
      const a = src[a0 + k];
      const b = src[b0 + k];
      out[k] = a > 0 && b > 0 ? Math.exp((1 - s) * Math.log(a) + s * Math.log(b)) : (1 - s) * a + s * b;
    }
    q[name] = out;
  }
  const plane: LengthPlane = { l: node >= 0 ? axes.l[node] : l, dims, q: q as LengthPlane['q'], estimated: {} };
  estimateMissing(plane, table);
  return plane;
}

// A table without gm, gds or gmb still gives a usable slice: the missing
// conductance is the slope of id along vgs, vds or vsb in this plane (central
// differences, the query-time estimator; src/numeric/difference.ts says why the
// importer smooths instead). gmb = −∂id/∂vsb, since raising vsb raises the threshold.
function estimateMissing(plane: LengthPlane, table: DeviceTable): void {
  const { vgs, vds, vsb } = table.axes;
  const id = plane.q.id;
  if (!plane.q.gm) {
    plane.q.gm = nodeDerivative(id, plane.dims, 0, vgs);
    plane.estimated.gm = 'central difference of id along vgs';
  }
  if (!plane.q.gds) {
    plane.q.gds = nodeDerivative(id, plane.dims, 1, vds);
    plane.estimated.gds = 'central difference of id along vds';
  }
  if (!plane.q.gmb) {
    const d = nodeDerivative(id, plane.dims, 2, vsb);
    for (let k = 0; k < d.length; k++) d[k] = 0 - d[k]; // 0 − x, not −x: no negative zeros
    plane.q.gmb = d;
    plane.estimated.gmb = vsb.length > 1
      ? 'minus the central difference of id along vsb'
      : 'unavailable (single vsb point): NaN';
  }
}
