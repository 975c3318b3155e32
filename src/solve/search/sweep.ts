import type { LengthSlice } from '../../device/types.js';
import { vgsWindow, type VdsMode } from '../../stack/invert.js';

const N = 64;
// Rows of a sweep's block: jd and gm at the N + 1 samples (VGS and gm/ID follow from them).
const JD = 0;
const GM = N + 1;
const BLOCK = 2 * (N + 1);

// Sweeps take their blocks from shared chunks: one typed array per sweep would be an allocation each.
// Memory is what costs here (fresh pages), so blocks hold only what every sweep needs.
const PER_CHUNK = 64;
let chunk = new Float64Array(0);
let used = PER_CHUNK;
function block(): [Float64Array, number] {
  if (used === PER_CHUNK) {
    chunk = new Float64Array(PER_CHUNK * BLOCK);
    used = 0;
  }
  return [chunk, used++ * BLOCK];
}

const buf = new Float64Array(4);

/**
 * Per-width values sampled along VGS at one VDS (or diode) and VSB, for cheap
 * screening. Samples are taken on demand from the top of the window down (a
 * gm/ID crossing is found scanning down from strong inversion, so the weak
 * inversion end is often never needed), and gds, gmb only at the samples that
 * bracket a crossing: the same values a full sweep would hold, fewer lookups.
 */
export class Sweep {
  private readonly v: Float64Array;
  private readonly o: number;
  // Samples j ≥ low are taken.
  private low = N + 1;
  // gds, gmb at the samples (rows of N + 1; NaN until looked up), for sweeps whose crossings need them.
  private sm: Float64Array | undefined;
  /** Cell and fraction of the last crossing found by `atGmid`. */
  j = 0;
  t = 0;
  /**
   * Where the last scan stopped: a scan for a higher target may start there
   * (every sample above it is below the lower target, hence below the higher);
   * -1 when it ran off the bottom.
   */
  stop = N - 1;

  // The VDS mode as a flag and a number (NaN for a diode): a field holding either a string or a number would change
  // representation when the first diode sweep is made, and code optimised for the first would be thrown away.
  private readonly diode: boolean;
  private readonly vds: number;

  constructor(
    private readonly slice: LengthSlice,
    mode: VdsMode,
    private readonly vsb: number,
    private readonly lo: number,
    private readonly hi: number,
  ) {
    this.diode = mode === 'diode';
    this.vds = mode === 'diode' ? NaN : mode;
    [this.v, this.o] = block();
  }

  // VGS of sample j (the same expression every time, so the same value).
  private vgsOf(j: number): number {
    return this.lo + ((this.hi - this.lo) * j) / N;
  }

  // Take samples down to j (jd and gm only: the same values small() gives, half the work).
  private reach(j: number): void {
    const s = this.slice;
    const v = this.v;
    const o = this.o;
    while (this.low > j) {
      const k = --this.low;
      const vgs = this.vgsOf(k);
      const vds = this.diode ? vgs : this.vds;
      if (s.jdGm) s.jdGm(vgs, vds, this.vsb, buf);
      else s.small(vgs, vds, this.vsb, buf);
      v[o + JD + k] = buf[0];
      v[o + GM + k] = buf[1];
    }
  }

  // gds and gmb at sample j (a NaN from the table is merely looked up again).
  private withSmall(j: number): Float64Array {
    let sm = this.sm;
    if (!sm) this.sm = sm = new Float64Array(2 * (N + 1)).fill(NaN);
    if (Number.isNaN(sm[j])) {
      const vgs = this.vgsOf(j);
      const r = this.slice.small(vgs, this.diode ? vgs : this.vds, this.vsb, buf);
      sm[j] = r[2];
      sm[N + 1 + j] = r[3];
    }
    return sm;
  }

  /**
   * Where gm/ID falls through `target`, scanning down from sample `from`
   * (N − 1: the top of the sweep, strong inversion side): true with the cell in
   * `j`, `t`; false when it does not, or jd there is not positive.
   */
  atGmid(target: number, from = N - 1): boolean {
    if (from < 0) {
      this.stop = -1;
      return false;
    }
    if (from < this.low) this.reach(from);
    const v = this.v;
    const jd = this.o + JD;
    const gm = this.o + GM;
    // gm/ID (Infinity where jd ≤ 0) at sample j + 1 (b) and j (a); b carries over as the next a.
    let x = v[jd + from + 1];
    let b = x > 0 ? v[gm + from + 1] / x : Infinity;
    for (let j = from; j >= 0; j--) {
      if (j < this.low) this.reach(j);
      x = v[jd + j];
      const a = x > 0 ? v[gm + j] / x : Infinity;
      if (b < target && a >= target) {
        this.stop = j;
        this.j = j;
        this.t = Number.isFinite(a) ? (a - target) / (a - b) : 1;
        return this.value(v, jd) > 0;
      }
      if (b >= target) {
        this.stop = j;
        return false;
      }
      b = a;
    }
    this.stop = -1;
    return false;
  }

  // Linear between the samples of the last crossing in row `row` of `v` (no closure: this runs for every option).
  private value(v: Float64Array, row: number): number {
    const j = row + this.j;
    return v[j] + this.t * (v[j + 1] - v[j]);
  }

  /** VGS at the last crossing, V. */
  crossVgs(): number {
    const a = this.vgsOf(this.j);
    return a + this.t * (this.vgsOf(this.j + 1) - a);
  }

  /** jd (per width) at the last crossing, A/m. */
  crossJd(): number {
    return this.value(this.v, this.o + JD);
  }

  /** gm, gds, gmb (per width) at the last crossing into out[0..2]. */
  crossSmall(out: Float64Array): void {
    this.withSmall(this.j);
    const sm = this.withSmall(this.j + 1);
    out[0] = this.value(this.v, this.o + GM);
    out[1] = this.value(sm, 0);
    out[2] = this.value(sm, N + 1);
  }
}

/** Top sample index: where a scan over ascending gm/ID targets starts. */
export const SWEEP_TOP = N - 1;

/** A sweep over the slice's VGS window at VDS `mode` and `vsb`; null when the table does not cover it. */
export function sweepVgs(slice: LengthSlice, mode: VdsMode, vsb: number): Sweep | null {
  const win = vgsWindow(slice, mode, vsb);
  return win ? new Sweep(slice, mode, vsb, win[0], win[1]) : null;
}
