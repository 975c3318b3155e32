import { slopeAt, slopeStencil } from './slope.js';
import { forEachLine } from './strides.js';

/*
 * Derivatives of a row-major block along one axis at its nodes: the one home of
 * the estimators of conductances a table lacks (gm = ∂id/∂vgs, gds = ∂id/∂vds,
 * gmb = −∂id/∂vsb). Two methods, for two different jobs:
 *
 * - `smoothedDerivative` (local least-squares polynomial) is for import: the
 *   simulator's id carries noise, and the derived conductance is stored in the
 *   table for good, so it is smoothed once (src/ingest/derive.ts).
 * - `nodeDerivative` (central differences) is for query time: the table was
 *   stored without a conductance (e.g. a single-point or two-point vsb axis the
 *   importer does not derive over, or a table written by other means); the grid
 *   is what it is, so no smoothing is added to it (src/device/plane.ts).
 *
 * Both: f and the result have blockSize(dims) elements; x is the axis `along`,
 * strictly increasing, in its own unit; the result is in f-units per x-unit.
 */

/**
 * Central differences (f[k+1]-f[k-1])/(x[k+1]-x[k-1]) inside, one-sided at the
 * ends. An axis with a single point gives NaN (no derivative can be formed)
 * rather than a made-up 0. Like numpy.gradient(f, x, axis=along, edge_order=1)
 * on a C-ordered block of shape dims (non-uniform x uses the outer points, not
 * NumPy's weighted form).
 */
export function nodeDerivative(f: Float64Array, dims: readonly number[], along: number, x: ArrayLike<number>): Float64Array {
  const out = new Float64Array(f.length);
  const n = dims[along];
  if (n < 2) return out.fill(NaN);
  forEachLine(dims, along, (base, stride) => {
    for (let k = 0; k < n; k++) {
      const lo = k === 0 ? k : k - 1;
      const hi = k === n - 1 ? k : k + 1;
      out[base + k * stride] = (f[base + hi * stride] - f[base + lo * stride]) / (x[hi] - x[lo]);
    }
  });
  return out;
}

/**
 * Slope of a local least-squares polynomial (degree ≤ 2) over `window` points
 * around each node (windows shift inward at the ends); see `slopeStencil` for
 * the SciPy savgol_filter reference. Non-finite f inside a window gives a
 * non-finite slope there (the caller decides the fallback).
 */
export function smoothedDerivative(f: ArrayLike<number>, dims: readonly number[], along: number, x: ArrayLike<number>, window: number): Float64Array {
  const out = new Float64Array(f.length);
  const st = slopeStencil(x, window);
  const n = dims[along];
  forEachLine(dims, along, (base, stride) => {
    for (let i = 0; i < n; i++) out[base + i * stride] = slopeAt(st, i, f, base, stride);
  });
  return out;
}
