import { createRequire } from 'node:module';

interface PolyFit {
  coefficients: number[];
}
type PolyCtor = new (x: number[], y: number[], degree: number) => PolyFit;
// Loaded on first use, not at import: device/ and the table slice import this module for
// conductance estimates, and `probe`/`size` should not pay ml-regression's start-up.
let polyCtor: PolyCtor | undefined;
function PolynomialRegressionCtor(): PolyCtor {
  polyCtor ??= (createRequire(import.meta.url)('ml-regression') as { PolynomialRegression: PolyCtor }).PolynomialRegression;
  return polyCtor;
}

/**
 * Weights for the slope of a local least-squares polynomial (Savitzky–Golay
 * style) at each point of a possibly non-uniform axis: slope_i = Σ_k w[i,k]·y[start_i + k].
 * The fit is linear in y, so fitting the unit vectors once per point gives the
 * weights for every curve along this axis. Windows shift inward at the ends.
 * Matches SciPy savgol_filter(y, window, degree, deriv=1, mode="interp") on a
 * uniform axis; x strictly increasing, length ≥ window; slopes in y-units per x-unit.
 */
export interface SlopeStencil {
  /** Points per window. */
  width: number;
  /** Polynomial degree used. */
  degree: number;
  start: Int32Array;
  /** Row-major n × width. */
  weights: Float64Array;
}

export function slopeStencil(x: ArrayLike<number>, window = 5, maxDegree = 2): SlopeStencil {
  const n = x.length;
  const width = Math.min(window, n);
  const degree = Math.min(maxDegree, width - 1);
  const start = new Int32Array(n);
  const weights = new Float64Array(n * width);
  for (let i = 0; i < n; i++) {
    const s = Math.min(Math.max(i - (width >> 1), 0), n - width);
    start[i] = s;
    // Centre on x_i and scale to O(1) so the normal equations stay well conditioned.
    const span = x[s + width - 1] - x[s];
    const xs: number[] = [];
    for (let k = 0; k < width; k++) xs.push((x[s + k] - x[i]) / span);
    for (let k = 0; k < width; k++) {
      const e = new Array<number>(width).fill(0);
      e[k] = 1;
      const c = new (PolynomialRegressionCtor())(xs, e, degree).coefficients;
      weights[i * width + k] = (c[1] ?? 0) / span;
    }
  }
  return { width, degree, start, weights };
}

/** Apply a stencil to one curve read with a stride from `y` starting at `base`. */
export function slopeAt(st: SlopeStencil, i: number, y: ArrayLike<number>, base: number, stride: number): number {
  let acc = 0;
  const o = i * st.width;
  const b = base + st.start[i] * stride;
  for (let k = 0; k < st.width; k++) acc += st.weights[o + k] * y[b + k * stride];
  return acc;
}
