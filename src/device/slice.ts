import { AxisLocator, coveredEdges } from '../numeric/axis.js';
import { rowMajorStrides } from '../numeric/strides.js';
import { rangeError } from '../numeric/range-error.js';
import type { StackwrightError } from '../errors.js';
import { tableLabel } from '../table/label.js';
import { formatEng } from '../units/index.js';
import type { DeviceTable, StoredQuantity } from '../table/types.js';
import type { LengthSlice, OperatingPoint } from './types.js';
import { LOG_ALONG_VGS, lengthPlane } from './plane.js';
import type { LengthPlane } from './plane.js';

/**
 * How a slice reads a table (the README quotes this):
 *
 * - Across L, for L between two table lengths: log–log, ln(value) linear in ln L,
 *   because currents, conductances and capacitances follow power laws in L; the
 *   result is bounded by the two neighbours. Values ≤ 0 fall back to linear in ln L.
 *   The merged plane is built once per slice, so a query touches one plane.
 * - Within the plane: bilinear in (vds, vsb) on the value at the two VGS
 *   neighbours, then along VGS geometric (ln value linear in VGS) for id, gm,
 *   gds and gmb when both neighbours are > 0, as they vary exponentially in weak
 *   inversion; linear otherwise. Capacitances are plain trilinear.
 * - Missing gm, gds or gmb are estimated from id by central differences in the
 *   plane (gmb = −∂id/∂vsb), never taken as 0; see `estimated`.
 * - Out of range on any axis throws StackwrightError kind 'range'; nothing is extrapolated.
 *
 * Everything is per metre of width: table value / referenceWidth.
 */
export class TableSlice implements LengthSlice {
  // `declare`d fields are set in the constructor without an undefined first (see AxisLocator).
  declare readonly l: number;
  declare readonly table: DeviceTable;
  declare readonly range: { vgs: [number, number]; vds: [number, number]; vsb: [number, number] };
  declare readonly edges: Float64Array;
  /** Conductances estimated because the table lacks them, with how. */
  declare readonly estimated: Partial<Record<StoredQuantity, string>>;
  declare private readonly plane: LengthPlane;
  declare private readonly perW: number;
  declare private readonly lg: AxisLocator;
  declare private readonly ld: AxisLocator;
  declare private readonly ls: AxisLocator;
  declare private readonly sG: number;
  declare private readonly sD: number;
  declare private readonly sS: number;
  // Row-major strides of the plane along vgs and vds (vsb's is 1).
  declare private readonly stG: number;
  declare private readonly stD: number;
  declare private readonly label: string;
  // Cell of the last locate(): base offset and fractions.
  private base = 0;
  private tg = 0;
  private td = 0;
  private ts = 0;
  // Width of that cell along each axis.
  private wG = NaN;
  private wD = NaN;
  private wS = NaN;
  // The point of that cell: a lookup at the same point again (Newton's last pass, then the small-signal
  // values at the solution) reuses it. NaN until the first lookup succeeds.
  private atG = NaN;
  private atD = NaN;
  private atS = NaN;
  private readonly scratch = new Float64Array(4);
  private readonly bias = new Float64Array(3);
  // Direct references for the hot path: id, then the conductances in small()'s order.
  declare private readonly pId: Float64Array;
  declare private readonly small4: Float64Array[];

  constructor(table: DeviceTable, l: number) {
    this.table = table;
    this.plane = lengthPlane(table, l);
    this.l = l;
    this.label = tableLabel(table.meta);
    this.estimated = this.plane.estimated;
    this.perW = 1 / table.meta.referenceWidth;
    const q = this.plane.q;
    this.pId = q.id;
    // plane.ts fills any missing conductance with an estimate, so these exist.
    this.small4 = [q.id, q.gm as Float64Array, q.gds as Float64Array, q.gmb as Float64Array];
    this.lg = new AxisLocator(table.axes.vgs);
    this.ld = new AxisLocator(table.axes.vds);
    this.ls = new AxisLocator(table.axes.vsb);
    const [stG, stD] = rowMajorStrides(this.plane.dims);
    this.stG = stG;
    this.stD = stD;
    // Offsets to the upper neighbour along each axis (0 on a single-point axis).
    this.sS = this.ls.step;
    this.sD = this.ld.step * stD;
    this.sG = this.lg.step * stG;
    this.range = {
      vgs: [this.lg.lo, this.lg.hi],
      vds: [this.ld.lo, this.ld.hi],
      vsb: [this.ls.lo, this.ls.hi],
    };
    this.edges = coveredEdges(this.range.vgs, this.range.vds, this.range.vsb);
  }

  /** Whether the table stores (or this slice estimated) a quantity. */
  has(q: StoredQuantity): boolean {
    return this.plane.q[q] !== undefined;
  }

  jd(vgs: number, vds: number, vsb: number): number {
    this.place(vgs, vds, vsb);
    this.evalInto(0, 1, this.scratch);
    return this.scratch[0];
  }

  small(vgs: number, vds: number, vsb: number, out?: Float64Array): Float64Array {
    const res = out ?? new Float64Array(4);
    this.place(vgs, vds, vsb);
    this.evalInto(0, 4, res);
    return res;
  }

  /**
   * jd and the exact partial derivatives of this slice's interpolant (per metre of width), one cell lookup:
   * out = [jd, ∂jd/∂vgs, ∂jd/∂vds, ∂jd/∂vsb]. jd is bit-identical to `jd()`. The derivatives are those of
   * the cell holding the point (the cell above on a node, the last cell at the upper edge), i.e. the limit of
   * a forward difference (backward at the upper edge); 0 along a single-point axis. The bias is read from
   * `at` = [vgs, vds, vsb] (see LengthSlice.jdSlopes); false, and `out` untouched, outside the table.
   */
  jdSlopes(at: Float64Array, out: Float64Array): boolean {
    if (!this.locate(at)) return false;
    const p = this.pId;
    const b = this.base;
    const u = this.td;
    const v = this.ts;
    const sD = this.sD;
    const sS = this.sS;
    // Lower VGS plane (a) and upper (c): value and slopes along u (vds) and v (vsb) of the bilinear form.
    const a00 = p[b], a01 = p[b + sS], a10 = p[b + sD], a11 = p[b + sD + sS];
    const bG = b + this.sG;
    const c00 = p[bG], c01 = p[bG + sS], c10 = p[bG + sD], c11 = p[bG + sD + sS];
    const aLo = (1 - v) * a00 + v * a01;
    const aHi = (1 - v) * a10 + v * a11;
    const a = (1 - u) * aLo + u * aHi;
    const au = aHi - aLo;
    const av = (1 - u) * (a01 - a00) + u * (a11 - a10);
    const cLo = (1 - v) * c00 + v * c01;
    const cHi = (1 - v) * c10 + v * c11;
    const c = (1 - u) * cLo + u * cHi;
    const cu = cHi - cLo;
    const cv = (1 - u) * (c01 - c00) + u * (c11 - c10);
    const t = this.tg;
    // Linear along VGS first, on every call (as in eval: a branch never run before optimisation costs a recompile).
    let f = t === 0 ? a : t === 1 ? c : (1 - t) * a + t * c;
    let ft = c - a;
    let fu = (1 - t) * au + t * cu;
    let fv = (1 - t) * av + t * cv;
    if (a > 0 && c > 0) {
      // Geometric along VGS: f = a·(c/a)^t, the same expression as eval().
      const lr = Math.log(c / a);
      f = t === 0 ? a : t === 1 ? c : a * Math.exp(t * lr);
      ft = f * lr;
      fu = f * ((1 - t) * (au / a) + t * (cu / c));
      fv = f * ((1 - t) * (av / a) + t * (cv / c));
    }
    const k = this.perW;
    out[0] = f * k;
    out[1] = this.lg.step ? (ft * k) / this.wG : 0;
    out[2] = this.ld.step ? (fu * k) / this.wD : 0;
    out[3] = this.ls.step ? (fv * k) / this.wS : 0;
    return true;
  }

  /** [gm/W, gds/W, gmb/W] at `at` = [vgs, vds, vsb] into out[0..2], the same values as small()[1..3]: a DC solve has jd from jdSlopes. */
  conductances(at: Float64Array, out: Float64Array): void {
    if (!this.locate(at)) throw this.outside(at);
    this.evalInto(1, 4, out);
  }

  /** [jd, gm/W] into out[0..1], the same values as small(): half the work for gm/ID searches. */
  jdGm(vgs: number, vds: number, vsb: number, out: Float64Array): void {
    this.place(vgs, vds, vsb);
    this.evalInto(0, 2, out);
  }

  /** One quantity at the reference width (NaN when the table lacks it). */
  value(q: StoredQuantity, vgs: number, vds: number, vsb: number): number {
    const block = this.plane.q[q];
    this.place(vgs, vds, vsb);
    return block ? this.eval(block, LOG_ALONG_VGS.has(q)) : NaN;
  }

  op(vgs: number, vds: number, vsb: number, w: number): OperatingPoint {
    const s = this.small(vgs, vds, vsb, this.scratch);
    const q = this.plane.q;
    const scale = w * this.perW;
    const cap = (b: Float64Array | undefined): number => (b ? this.eval(b, false) * scale : NaN);
    const id = s[0] * w;
    const gm = s[1] * w;
    const gds = s[2] * w;
    const cgg = cap(q.cgg);
    return {
      l: this.l, w, vgs, vds, vsb,
      id, gm, gds, gmb: s[3] * w,
      cgg, cgs: cap(q.cgs), cgd: cap(q.cgd), cdd: cap(q.cdd),
      gmid: gm / id,
      jd: s[0],
      gain: gm / gds,
      ft: gm / (2 * Math.PI * cgg),
    };
  }

  // locate for a bias given as numbers (through `bias`: the locators read it from an array), or a 'range' error.
  private place(vgs: number, vds: number, vsb: number): void {
    const at = this.bias;
    at[0] = vgs;
    at[1] = vds;
    at[2] = vsb;
    if (!this.locate(at)) throw this.outside(at);
  }

  // The 'range' error of a bias outside the table, naming the first axis it is outside.
  private outside(at: Float64Array): StackwrightError {
    const axes = [this.lg, this.ld, this.ls];
    const k = axes.findIndex((a, j) => a.locateIn(at, j) < 0);
    return rangeError(AXES[k], at[k], axes[k].lo, axes[k].hi, 'V', this.where());
  }

  // The cell holding at = [vgs, vds, vsb]; false outside the table (the same test as stack/range `covers`).
  private locate(at: Float64Array): boolean {
    const vgs = at[0];
    const vds = at[1];
    const vsb = at[2];
    if (vgs === this.atG && vds === this.atD && vsb === this.atS) return true;
    // Each axis' last cell first, then its search: AxisLocator.locateIn written out (the same cell and fraction).
    const lg = this.lg;
    const ld = this.ld;
    const ls = this.ls;
    let ig: number, id: number, is: number;
    let tg: number, td: number, ts: number;
    if (vgs >= lg.cellLo && vgs < lg.cellHi) {
      ig = lg.cell;
      tg = (vgs - lg.cellLo) / lg.width + 0;
    } else {
      ig = lg.search(at, 0);
      tg = lg.t;
    }
    if (vds >= ld.cellLo && vds < ld.cellHi) {
      id = ld.cell;
      td = (vds - ld.cellLo) / ld.width + 0;
    } else {
      id = ld.search(at, 1);
      td = ld.t;
    }
    if (vsb >= ls.cellLo && vsb < ls.cellHi) {
      is = ls.cell;
      ts = (vsb - ls.cellLo) / ls.width + 0;
    } else {
      is = ls.search(at, 2);
      ts = ls.t;
    }
    if (ig < 0 || id < 0 || is < 0) return false;
    this.base = ig * this.stG + id * this.stD + is;
    this.wG = lg.width;
    this.wD = ld.width;
    this.wS = ls.width;
    this.tg = tg;
    this.td = td;
    this.ts = ts;
    this.atG = vgs;
    this.atD = vds;
    this.atS = vsb;
    return true;
  }

  private where(): string {
    return `${this.label} at l = ${formatEng(this.l, 'm', 6)}`;
  }

  // Bilinear in (vds, vsb) at both VGS neighbours, then geometric or linear along VGS.
  // The bilinear form is written out twice: a helper returning a double boxes it whenever it is not inlined.
  private eval(p: Float64Array, logVgs: boolean): number {
    const b = this.base;
    const u = this.td;
    const v = this.ts;
    const sD = this.sD;
    const sS = this.sS;
    const a = (1 - u) * ((1 - v) * p[b] + v * p[b + sS]) + u * ((1 - v) * p[b + sD] + v * p[b + sD + sS]);
    const g = b + this.sG;
    const c = (1 - u) * ((1 - v) * p[g] + v * p[g + sS]) + u * ((1 - v) * p[g + sD] + v * p[g + sD + sS]);
    const t = this.tg;
    if (t === 0) return a;
    if (t === 1) return c;
    // The linear value is worked out on every call: a branch the compiler has never seen run throws its code away.
    const lin = (1 - t) * a + t * c;
    // a·(c/a)^t is exp((1−t)·ln a + t·ln c) with one log fewer.
    return logVgs && a > 0 && c > 0 ? a * Math.exp(t * Math.log(c / a)) : lin;
  }

  // eval(q, true) · perW of small()'s quantities from..to−1 into out[0..]: one call for them all (the CLI runs without
  // inlining), and no double passed or returned, so none is boxed.
  private evalInto(from: number, to: number, out: Float64Array): void {
    const b = this.base;
    const u = this.td;
    const v = this.ts;
    const sD = this.sD;
    const sS = this.sS;
    const g = b + this.sG;
    const t = this.tg;
    const k = this.perW;
    for (let q = from; q < to; q++) {
      const p = this.small4[q];
      const a = (1 - u) * ((1 - v) * p[b] + v * p[b + sS]) + u * ((1 - v) * p[b + sD] + v * p[b + sD + sS]);
      const c = (1 - u) * ((1 - v) * p[g] + v * p[g + sS]) + u * ((1 - v) * p[g + sD] + v * p[g + sD + sS]);
      // As in eval: the linear value on every call, so its arithmetic has type feedback when a sign change needs it.
      const lin = (1 - t) * a + t * c;
      out[q - from] = (t === 0 ? a : t === 1 ? c : a > 0 && c > 0 ? a * Math.exp(t * Math.log(c / a)) : lin) * k;
    }
  }
}

const AXES = ['vgs', 'vds', 'vsb'] as const;

const slices = new WeakMap<DeviceTable, Map<number, TableSlice>>();
/** Enough for a solver's L sweep; older slices are dropped first. */
const MAX_SLICES_PER_TABLE = 64;

/** The slice of `table` at channel length `l` (m), cached per table and L. */
export function sliceAt(table: DeviceTable, l: number): TableSlice {
  let byL = slices.get(table);
  if (!byL) {
    byL = new Map();
    slices.set(table, byL);
  }
  const hit = byL.get(l);
  if (hit) return hit;
  const s = new TableSlice(table, l);
  if (byL.size >= MAX_SLICES_PER_TABLE) byL.delete(byL.keys().next().value as number);
  byL.set(l, s);
  return s;
}
