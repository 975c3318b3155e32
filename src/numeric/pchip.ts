import { rangeError } from './range-error.js';
import { cellOf, edgeTolerance } from './axis.js';

/**
 * Monotone piecewise-cubic Hermite interpolation (Fritsch–Carlson; interior
 * slopes by the weighted harmonic mean of Fritsch & Butland 1984, ends by the
 * shape-preserving three-point formula), the same construction as SciPy's
 * PchipInterpolator. Monotone data stays monotone: no overshoot between samples.
 *
 * @param x  strictly increasing abscissae, length n
 * @param y  values at x, length n
 * @returns  slopes dy/dx at x, length n (SciPy: PchipInterpolator(x, y).derivative()(x))
 */
export function pchipSlopes(x: ArrayLike<number>, y: ArrayLike<number>): Float64Array {
  const n = x.length;
  const d = new Float64Array(n);
  if (n < 2) return d;
  const h = new Float64Array(n - 1);
  const m = new Float64Array(n - 1);
  for (let k = 0; k < n - 1; k++) {
    h[k] = x[k + 1] - x[k];
    m[k] = (y[k + 1] - y[k]) / h[k];
  }
  if (n === 2) {
    d[0] = d[1] = m[0];
    return d;
  }
  for (let k = 1; k < n - 1; k++) {
    const a = m[k - 1];
    const b = m[k];
    if (a === 0 || b === 0 || Math.sign(a) !== Math.sign(b)) {
      d[k] = 0;
    } else {
      const w1 = 2 * h[k] + h[k - 1];
      const w2 = h[k] + 2 * h[k - 1];
      d[k] = (w1 + w2) / (w1 / a + w2 / b);
    }
  }
  d[0] = endSlope(h[0], h[1], m[0], m[1]);
  d[n - 1] = endSlope(h[n - 2], h[n - 3], m[n - 2], m[n - 3]);
  return d;
}

function endSlope(h0: number, h1: number, m0: number, m1: number): number {
  let d = ((2 * h0 + h1) * m0 - h0 * m1) / (h0 + h1);
  if (Math.sign(d) !== Math.sign(m0)) d = 0;
  else if (Math.sign(m0) !== Math.sign(m1) && Math.abs(d) > 3 * Math.abs(m0)) d = 3 * m0;
  return d;
}

/**
 * Value at t of the cubic Hermite interpolant through (x, y) with slopes d
 * (SciPy: CubicHermiteSpline(x, y, d, extrapolate=False)(t)).
 *
 * @param x  strictly increasing abscissae, length n ≥ 1
 * @param y  values at x, length n
 * @param d  slopes dy/dx at x, length n (e.g. from pchipSlopes)
 * @param t  query inside [x0, x_{n−1}] (1e-9 of the span of slack at the ends)
 * @throws   StackwrightError kind 'range' when t is outside: never extrapolates
 */
export function hermiteAt(x: ArrayLike<number>, y: ArrayLike<number>, d: ArrayLike<number>, t: number): number {
  const n = x.length;
  const slack = edgeTolerance(x[0], x[n - 1]);
  if (!(t >= x[0] - slack && t <= x[n - 1] + slack)) throw rangeError('x', t, x[0], x[n - 1]);
  if (n === 1) return y[0];
  const lo = cellOf(x, t);
  const hi = lo + 1;
  const h = x[hi] - x[lo];
  const s = (t - x[lo]) / h;
  if (s === 0) return y[lo];
  if (s === 1) return y[hi];
  const s2 = s * s;
  const s3 = s2 * s;
  return (2 * s3 - 3 * s2 + 1) * y[lo] + (s3 - 2 * s2 + s) * h * d[lo] + (-2 * s3 + 3 * s2) * y[hi] + (s3 - s2) * h * d[hi];
}

/** PCHIP through (x, y) at each target (SciPy: PchipInterpolator(x, y, extrapolate=False)); throws kind 'range' outside [x0, x_{n−1}]. */
export function pchip(x: ArrayLike<number>, y: ArrayLike<number>, targets: ArrayLike<number>): Float64Array {
  const d = pchipSlopes(x, y);
  const out = new Float64Array(targets.length);
  for (let i = 0; i < targets.length; i++) out[i] = hermiteAt(x, y, d, targets[i]);
  return out;
}
