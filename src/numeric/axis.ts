import { TABLE_EDGE } from '../policy.js';

/**
 * Finds the cell of a strictly increasing axis that holds a value, without
 * allocating. The cell found last is tried first (lookups are local); then
 * uniform axes get an O(1) index guess, others a binary search.
 * Values within `tolerance` (1e-9 of the span) of an edge count as on the edge,
 * so rounding in callers does not turn into range errors; nothing farther out
 * is accepted. Like numpy.searchsorted(values, x, 'right') − 1 clipped to the
 * last cell; `locate` returns −1 (no cell) rather than clamping outside.
 */
export class AxisLocator {
  // Fields set in the constructor are `declare`d: a plain declaration compiles to a class field defined as
  // undefined first, which leaves V8 a generic field and a type check at every read on the lookup path.
  declare readonly values: Float64Array;
  declare readonly n: number;
  declare readonly lo: number;
  declare readonly hi: number;
  declare readonly tolerance: number;
  /** 0 for a single-point axis (the neighbour is the point itself), else 1. */
  declare readonly step: 0 | 1;
  /** Fraction across the cell found by the last successful `locate`. */
  t = 0;
  /** Width v[i + 1] − v[i] of that cell (NaN before the first `locate` and on a single-point axis). */
  width = NaN;
  declare private readonly uniform: boolean;
  declare private readonly invStep: number;
  /**
   * The last cell found, [cellLo, cellHi): lookups are local (Newton steps, sweeps), so most land in it again.
   * Empty until a cell is found; never set on a single-point axis. Read by TableSlice, which tries it itself
   * (as locateIn does) before it calls `search`: a call per axis costs (the CLI runs without inlining).
   */
  cell = 0;
  cellLo = Infinity;
  cellHi = -Infinity;
  // The cell found before it, tried next: lookups alternate between two cells (the devices of one length in a stack).
  private prevCell = 0;
  private prevLo = Infinity;
  private prevHi = -Infinity;
  private prevWidth = NaN;
  // locate's x, for locateIn.
  private readonly x = new Float64Array(1);

  constructor(values: Float64Array) {
    this.values = values;
    this.n = values.length;
    this.lo = values[0];
    this.hi = values[this.n - 1];
    const span = this.hi - this.lo;
    this.tolerance = edgeTolerance(this.lo, this.hi);
    this.step = this.n > 1 ? 1 : 0;
    this.uniform = this.n > 2 && isUniform(values);
    this.invStep = this.n > 1 ? (this.n - 1) / span : 0;
  }

  /** Index of the lower node of the cell holding x (sets `t` and `width`), or -1 outside the axis or for NaN. */
  locate(x: number): number {
    this.x[0] = x;
    return this.locateIn(this.x, 0);
  }

  /**
   * locate(at[k]). The hot lookups read x from an array: they run without inlining, where a number argument is
   * boxed on every call.
   */
  locateIn(at: Float64Array, k: number): number {
    const x = at[k];
    // Inside the last cell (false for NaN): the cell and fraction a search would give, in a few instructions
    // (+ 0 turns the −0 of x = −0 on a lower end of 0 into the search's 0; it changes no other value).
    if (x >= this.cellLo && x < this.cellHi) {
      this.t = (x - this.cellLo) / this.width + 0;
      return this.cell;
    }
    return this.search(at, k);
  }

  /** locateIn without trying the last cell first. */
  search(at: Float64Array, k: number): number {
    const x = at[k];
    if (x >= this.prevLo && x < this.prevHi) {
      this.swapCells();
      this.t = (x - this.cellLo) / this.width + 0;
      return this.cell;
    }
    if (!(x >= this.lo - this.tolerance && x <= this.hi + this.tolerance)) return -1;
    const last = this.n - 2;
    if (last < 0) {
      this.t = 0;
      return 0;
    }
    const v = this.values;
    let i = x <= this.lo ? 0 : x >= this.hi ? last : this.uniform ? Math.floor((x - this.lo) * this.invStep) : cellOf(v, x);
    if (i > last) i = last;
    // A uniform axis' guess can be one off through rounding (its nodes are within 1e-9 of the span of the ideal
    // grid, far less than a step, so never more); the node values decide. No-ops otherwise.
    i -= i > 0 && x < v[i] ? 1 : 0;
    i += i < last && x >= v[i + 1] ? 1 : 0;
    if (i !== this.cell) this.swapCells();
    this.cell = i;
    this.cellLo = v[i];
    this.cellHi = v[i + 1];
    this.width = v[i + 1] - v[i];
    this.t = x <= this.lo ? 0 : x >= this.hi ? 1 : (x - v[i]) / this.width;
    return i;
  }

  // The last cell and the one before it change places.
  private swapCells(): void {
    const cell = this.cell;
    const lo = this.cellLo;
    const hi = this.cellHi;
    const width = this.width;
    this.cell = this.prevCell;
    this.cellLo = this.prevLo;
    this.cellHi = this.prevHi;
    this.width = this.prevWidth;
    this.prevCell = cell;
    this.prevLo = lo;
    this.prevHi = hi;
    this.prevWidth = width;
  }
}

/**
 * Distance beyond an axis' ends [lo, hi] still taken as on the end: TABLE_EDGE
 * (1e-9) of the span; for a single-point axis (lo = hi), of the value, plus 1e-12.
 * The one table-edge rule: the locator, hermiteAt and the stack layer's range checks use it.
 */
export function edgeTolerance(lo: number, hi: number): number {
  return hi !== lo ? TABLE_EDGE * Math.abs(hi - lo) : 1e-12 + TABLE_EDGE * Math.abs(lo);
}

/**
 * The axes' ends widened by edgeTolerance, flat [lo0, hi0, lo1, hi1, ...]: x is on axis k when
 * edges[2k] <= x <= edges[2k + 1], as the locator decides.
 */
export function coveredEdges(...axes: ReadonlyArray<readonly [number, number]>): Float64Array {
  const e = new Float64Array(2 * axes.length);
  axes.forEach(([lo, hi], k) => {
    const slack = edgeTolerance(lo, hi);
    e[2 * k] = lo - slack;
    e[2 * k + 1] = hi + slack;
  });
  return e;
}

/**
 * Lower node of the cell of strictly increasing `v` that holds x, by bisection:
 * the last i ≤ n − 2 with v[i] ≤ x, 0 below v[1] (numpy.searchsorted(v, x, 'right') − 1,
 * clipped to [0, n − 2]). Needs n ≥ 2.
 */
export function cellOf(v: ArrayLike<number>, x: number): number {
  let a = 0;
  let b = v.length - 1;
  while (b - a > 1) {
    const m = (a + b) >> 1;
    if (v[m] <= x) a = m;
    else b = m;
  }
  return a;
}

function isUniform(v: Float64Array): boolean {
  const n = v.length;
  const h = (v[n - 1] - v[0]) / (n - 1);
  const tol = 1e-9 * (v[n - 1] - v[0]);
  for (let k = 1; k < n - 1; k++) if (Math.abs(v[k] - (v[0] + k * h)) > tol) return false;
  return true;
}
