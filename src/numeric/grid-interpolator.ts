import { showNumber } from '../units/index.js';
import { StackwrightError } from '../errors.js';
import { AxisLocator } from './axis.js';
import { rangeError } from './range-error.js';
import { rowMajorStrides } from './strides.js';

/** What to do with a query outside the grid: throw (default) or return NaN. Never extrapolate. */
export type OutOfBounds = 'error' | 'nan';

export interface GridOptions {
  outOfBounds?: OutOfBounds;
  /** Axis names for messages (default "dimension k"). */
  names?: readonly string[];
  /** Axis units for messages. */
  units?: readonly string[];
  /** Appended to range errors, e.g. the table label. */
  context?: string;
}

/**
 * N-d multilinear interpolation on a rectilinear grid, values row-major (first
 * axis slowest). Same arithmetic as SciPy's RegularGridInterpolator(method='linear'):
 * the sum over the 2^N cell corners of value × product of weights, corners in the
 * same order, so results agree to rounding. One difference: a coordinate within
 * 1e-9 of an axis span outside an edge is taken as on the edge (rounding in the
 * caller), where SciPy would raise; anything farther out follows `outOfBounds`.
 */
export class RegularGridInterpolator {
  readonly ndim: number;
  readonly values: Float64Array;
  private readonly locators: AxisLocator[];
  private readonly strides: Int32Array;
  private readonly idx: Int32Array;
  private readonly frac: Float64Array;
  private readonly names: readonly string[];
  private readonly units: readonly string[];
  private readonly policy: OutOfBounds;
  private readonly context?: string;

  constructor(axes: ReadonlyArray<ArrayLike<number>>, values: ArrayLike<number>, opts: GridOptions = {}) {
    const names = opts.names ?? axes.map((_, k) => `dimension ${k}`);
    if (axes.length === 0) throw new StackwrightError('grid needs at least one dimension');
    const typed = axes.map((a, k) => checkAxis(a, k, names[k]));
    const size = typed.reduce((p, a) => p * a.length, 1);
    if (values.length !== size) {
      throw new StackwrightError(
        `grid values have ${values.length} entries but the axes (${typed.map((a) => a.length).join('×')}) need ${size}`,
      );
    }
    this.ndim = axes.length;
    this.values = values instanceof Float64Array ? values : Float64Array.from(values);
    this.locators = typed.map((a) => new AxisLocator(a));
    this.strides = Int32Array.from(rowMajorStrides(typed.map((a) => a.length)));
    this.idx = new Int32Array(this.ndim);
    this.frac = new Float64Array(this.ndim);
    this.names = names;
    this.units = opts.units ?? [];
    this.policy = opts.outOfBounds ?? 'error';
    this.context = opts.context;
  }

  /** Value at one point (length ndim). */
  interpolate(point: ArrayLike<number>): number {
    if (point.length !== this.ndim) {
      throw new StackwrightError(`grid point has ${point.length} coordinates, the grid has ${this.ndim} dimensions`);
    }
    return this.at(point, 0);
  }

  /** Values at m points stored row-major in `points` (m × ndim) into `out` (length m). */
  interpolateBatch(points: Float64Array, out?: Float64Array): Float64Array {
    const n = this.ndim;
    if (points.length % n !== 0) {
      throw new StackwrightError(`batch of ${points.length} coordinates is not a multiple of the ${n} dimensions`);
    }
    const m = points.length / n;
    const res = out ?? new Float64Array(m);
    if (res.length < m) throw new StackwrightError(`output array holds ${res.length} values, the batch has ${m} points`);
    for (let p = 0; p < m; p++) res[p] = this.at(points, p * n);
    return res;
  }

  private at(pts: ArrayLike<number>, base: number): number {
    const n = this.ndim;
    const idx = this.idx;
    const frac = this.frac;
    for (let d = 0; d < n; d++) {
      const loc = this.locators[d];
      const x = pts[base + d];
      const i = loc.locate(x);
      if (i < 0) {
        if (this.policy === 'nan') return NaN;
        throw rangeError(this.names[d], x, loc.lo, loc.hi, this.units[d] ?? '', this.context);
      }
      idx[d] = i;
      frac[d] = loc.t;
    }
    const v = this.values;
    const strides = this.strides;
    const corners = 1 << n;
    let sum = 0;
    for (let c = 0; c < corners; c++) {
      let w = 1;
      let off = 0;
      for (let d = 0; d < n; d++) {
        if ((c >> (n - 1 - d)) & 1) {
          w *= frac[d];
          off += (idx[d] + 1) * strides[d];
        } else {
          w *= 1 - frac[d];
          off += idx[d] * strides[d];
        }
      }
      sum += v[off] * w;
    }
    return sum;
  }
}

function checkAxis(a: ArrayLike<number>, k: number, name: string): Float64Array {
  const label = name === `dimension ${k}` ? name : `dimension ${k} (${name})`;
  if (a.length < 2) throw new StackwrightError(`grid ${label} needs at least 2 points, has ${a.length}`);
  for (let i = 0; i < a.length; i++) {
    if (!Number.isFinite(a[i])) throw new StackwrightError(`grid ${label} point ${i} is not a finite number (${a[i]})`);
    if (i > 0 && !(a[i] > a[i - 1])) {
      throw new StackwrightError(`grid ${label} is not strictly increasing at point ${i} (${showNumber(a[i - 1])} then ${showNumber(a[i])})`);
    }
  }
  return a instanceof Float64Array ? a : Float64Array.from(a);
}
