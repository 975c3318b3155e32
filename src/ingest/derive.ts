import type { Axis } from '../table/types.js';
import { slopeAt, slopeStencil } from '../numeric/slope.js';
import { rowMajorStrides } from '../numeric/strides.js';

export const WINDOW = 5;

/** Layout of a flat row-major grid (l, vgs, vds, vsb). */
export function strides(axes: Record<Axis, Float64Array>): Record<Axis, number> {
  const [l, vgs, vds, vsb] = rowMajorStrides([axes.l.length, axes.vgs.length, axes.vds.length, axes.vsb.length]);
  return { l, vgs, vds, vsb };
}

/**
 * Smoothed d(id)/d(axis) on the grid by a local quadratic over WINDOW points.
 * With `log`, the fit is of ln(id) and the slope is id·d(ln id): exact for the
 * exponential weak-inversion law and much better than a parabola there. Windows
 * holding a non-positive id fall back to fitting id itself. Returns magnitudes.
 */
export function deriveAlong(axes: Record<Axis, Float64Array>, id: Float64Array, axis: 'vgs' | 'vds' | 'vsb', log: boolean): Float64Array {
  const x = axes[axis];
  const n = x.length;
  const st = slopeStencil(x, WINDOW);
  const stride = strides(axes)[axis];
  const out = new Float64Array(id.length);
  const lnId = log ? id.map((v) => (v > 0 ? Math.log(v) : NaN)) : id;
  const block = stride * n;
  for (let outer = 0; outer < id.length; outer += block) {
    for (let inner = 0; inner < stride; inner++) {
      const base = outer + inner;
      for (let i = 0; i < n; i++) {
        let g = NaN;
        if (log) g = id[base + i * stride] * slopeAt(st, i, lnId, base, stride);
        if (!Number.isFinite(g)) g = slopeAt(st, i, id, base, stride);
        out[base + i * stride] = Math.abs(g);
      }
    }
  }
  return out;
}

export function describeDerivative(axis: string, log: boolean, n: number): string {
  const width = Math.min(WINDOW, n);
  const kind = width >= 3 ? 'local quadratic' : 'straight line';
  return `smoothed derivative of id over ${axis} (${kind}${log ? ' in ln id' : ''}, ${width} points)`;
}
