import { AXES, gridDims, type Axis } from '../table/types.js';
import { smoothedDerivative } from '../numeric/difference.js';

export const WINDOW = 5;

/**
 * Smoothed d(id)/d(axis) on the grid by a local quadratic over WINDOW points
 * (the import-time estimator; why it differs from the query-time one is said
 * in src/numeric/difference.ts). With `log`, the fit is of ln(id) and the slope
 * is id·d(ln id): exact for the exponential weak-inversion law and much better
 * than a parabola there. Windows holding a non-positive id fall back to fitting
 * id itself. Returns magnitudes.
 */
export function deriveAlong(axes: Record<Axis, Float64Array>, id: Float64Array, axis: 'vgs' | 'vds' | 'vsb', log: boolean): Float64Array {
  const dims = gridDims(axes);
  const along = AXES.indexOf(axis);
  const out = smoothedDerivative(id, dims, along, axes[axis], WINDOW);
  if (log) {
    const lnId = id.map((v) => (v > 0 ? Math.log(v) : NaN));
    const dLn = smoothedDerivative(lnId, dims, along, axes[axis], WINDOW);
    for (let k = 0; k < out.length; k++) {
      const g = id[k] * dLn[k];
      if (Number.isFinite(g)) out[k] = g;
    }
  }
  for (let k = 0; k < out.length; k++) out[k] = Math.abs(out[k]);
  return out;
}

export function describeDerivative(axis: string, log: boolean, n: number): string {
  const width = Math.min(WINDOW, n);
  const kind = width >= 3 ? 'local quadratic' : 'straight line';
  return `smoothed derivative of id over ${axis} (${kind}${log ? ' in ln id' : ''}, ${width} points)`;
}
