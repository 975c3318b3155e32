import { StackwrightError } from '../errors.js';
import { AXES, gridDims, type Axis, type StoredQuantity } from '../table/types.js';
import { formatEng, showValue } from '../units/index.js';
import { rowMajorIndex } from '../numeric/strides.js';

/** Bias point of flat index `k` of a row-major (l, vgs, vds, vsb) grid, for messages. */
export function biasPointAt(axes: Record<Axis, Float64Array>, k: number): string {
  const [il, ig, id, is] = rowMajorIndex(k, gridDims(axes));
  return `L=${formatEng(axes.l[il], 'm', 4)} vgs=${showValue(axes.vgs[ig], 'V')} vds=${showValue(axes.vds[id], 'V')} vsb=${showValue(axes.vsb[is], 'V')}`;
}

/**
 * Last guard before a table leaves the importer: every axis value and every stored or
 * derived number must be finite, so no NaN or Infinity reaches a table file or a solver.
 */
export function checkFinite(
  axes: Record<Axis, Float64Array>,
  data: Partial<Record<StoredQuantity, Float64Array>>,
  derived: ReadonlySet<string>,
  where: string,
): void {
  for (const a of AXES) {
    const v = axes[a];
    for (let i = 0; i < v.length; i++) {
      if (!Number.isFinite(v[i])) throw new StackwrightError(`axis ${a} holds ${String(v[i])} at position ${i + 1}`, { where, kind: 'input' });
    }
  }
  for (const [q, arr] of Object.entries(data) as Array<[StoredQuantity, Float64Array]>) {
    for (let k = 0; k < arr.length; k++) {
      const v = arr[k];
      if (v - v !== 0) {
        const how = derived.has(q) ? 'derived ' : '';
        throw new StackwrightError(`${how}${q} is ${String(v)} at bias point ${biasPointAt(axes, k)}; check the input rows around it`, { where, kind: 'input' });
      }
    }
  }
}
