/**
 * One transistor's operating point, as read from a table. Magnitudes, SI units.
 * Currents, conductances and capacitances are for the actual width `w`.
 */
export interface OperatingPoint {
  l: number;
  w: number;
  vgs: number;
  vds: number;
  vsb: number;
  id: number;
  gm: number;
  gds: number;
  gmb: number;
  /** Capacitances; NaN when the table has none. */
  cgg: number;
  cgs: number;
  cgd: number;
  cdd: number;
  /** gm/ID, 1/V. */
  gmid: number;
  /** Current density ID/W, A/m. */
  jd: number;
  /** Intrinsic gain gm/gds. */
  gain: number;
  /** Transit frequency gm/(2π·cgg), Hz; NaN without capacitances. */
  ft: number;
}

/**
 * A device model bound to one channel length (L may lie between table lengths).
 * All methods take stack-independent terminal voltages (magnitudes) and return
 * per-metre-of-width quantities, so one slice serves every width.
 * Methods throw StackwrightError(kind 'range') outside the table, naming the axis.
 */
export interface LengthSlice {
  readonly l: number;
  /** Drain current per metre of width, A/m. */
  jd(vgs: number, vds: number, vsb: number): number;
  /** Small-signal per metre of width: [jd, gm/W, gds/W, gmb/W]. */
  small(vgs: number, vds: number, vsb: number, out?: Float64Array): Float64Array;
  /**
   * Optional: jd and its exact partial derivatives along VGS, VDS and VSB (per metre of width) into
   * `out` = [jd, ∂jd/∂vgs, ∂jd/∂vds, ∂jd/∂vsb], for Newton; callers fall back to differences without it.
   * The bias comes in an array, `at` = [vgs, vds, vsb]: the CLI's compiler inlines no calls, and a number
   * argument is boxed on each one. False (and `out` untouched) outside the table, where the others throw.
   */
  jdSlopes?(at: Float64Array, out: Float64Array): boolean;
  /**
   * Optional: [gm/W, gds/W, gmb/W] only (entries 1..3 of `small`, the same values) at `at` = [vgs, vds, vsb]
   * into `out`, for a DC solve that already has jd at the point from `jdSlopes`.
   */
  conductances?(at: Float64Array, out: Float64Array): void;
  /** Optional: [jd, gm/W] only (the first two entries of `small`, the same values) into `out`, for gm/ID searches. */
  jdGm?(vgs: number, vds: number, vsb: number, out: Float64Array): void;
  /** Full operating point at width w. */
  op(vgs: number, vds: number, vsb: number, w: number): OperatingPoint;
  /** Valid voltage ranges of this slice. */
  readonly range: { vgs: [number, number]; vds: [number, number]; vsb: [number, number] };
  /**
   * The ranges widened by the table-edge tolerance, flat: [vgs lo, vgs hi, vds lo, vds hi, vsb lo, vsb hi]
   * (numeric/axis `coveredEdges`), so the range check of every DC-solve step is six comparisons.
   */
  readonly edges: Float64Array;
}
