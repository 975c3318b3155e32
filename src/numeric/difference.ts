import { rowMajorStrides } from './strides.js';

/**
 * Derivative of a row-major 3-D block along one dimension at its nodes:
 * central differences (f[k+1]-f[k-1])/(x[k+1]-x[k-1]) inside, one-sided at the
 * ends. Used to estimate a conductance the table does not store. An axis with a
 * single point gives NaN (no derivative can be formed) rather than a made-up 0.
 * Like numpy.gradient(f, x, axis=along, edge_order=1) on a C-ordered block of
 * shape dims (non-uniform x uses the outer points, not NumPy's weighted form).
 */
export function nodeDerivative(
  f: Float64Array,
  dims: readonly [number, number, number],
  along: 0 | 1 | 2,
  x: Float64Array,
): Float64Array {
  const out = new Float64Array(f.length);
  const n = dims[along];
  if (n < 2) return out.fill(NaN);
  const stride = rowMajorStrides(dims)[along];
  for (let base = 0; base < f.length; base++) {
    const k = Math.floor(base / stride) % n;
    const lo = k === 0 ? k : k - 1;
    const hi = k === n - 1 ? k : k + 1;
    out[base] = (f[base + (hi - k) * stride] - f[base + (lo - k) * stride]) / (x[hi] - x[lo]);
  }
  return out;
}
