import type { LengthSlice } from '../../device/types.js';
import { vgsWindow, type VdsMode } from '../../stack/invert.js';

const N = 64;
// Row offsets within a sweep's block: vgs, jd, gm, gm/ID, gds, gmb at the N + 1 samples.
const VGS = 0;
const JD = N + 1;
const GM = 2 * (N + 1);
const GMID = 3 * (N + 1);
const GDS = 4 * (N + 1);
const GMB = 5 * (N + 1);
const BLOCK = 6 * (N + 1);

// Sweeps take their blocks from shared chunks: one typed array per sweep would be an allocation each.
const PER_CHUNK = 64;
let chunk = new Float64Array(0);
let used = PER_CHUNK;
function block(): [Float64Array, number] {
  if (used === PER_CHUNK) {
    chunk = new Float64Array(PER_CHUNK * BLOCK);
    used = 0;
  }
  const o = used++ * BLOCK;
  // NaN marks gds and gmb not yet looked up.
  chunk.fill(NaN, o + GDS, o + BLOCK);
  return [chunk, o];
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
  /** Cell and fraction of the last crossing found by `atGmid`. */
  j = 0;
  t = 0;
  /**
   * Where the last scan stopped: a scan for a higher target may start there
   * (every sample above it is below the lower target, hence below the higher);
   * -1 when it ran off the bottom.
   */
  stop = N - 1;

  constructor(
    private readonly slice: LengthSlice,
    private readonly mode: VdsMode,
    private readonly vsb: number,
    private readonly lo: number,
    private readonly hi: number,
  ) {
    [this.v, this.o] = block();
  }

  // Take samples down to j (jd and gm only: the same values small() gives, half the work).
  private reach(j: number): void {
    const s = this.slice;
    const v = this.v;
    const o = this.o;
    while (this.low > j) {
      const k = --this.low;
      const vgs = this.lo + ((this.hi - this.lo) * k) / N;
      const vds = this.mode === 'diode' ? vgs : this.mode;
      if (s.jdGm) s.jdGm(vgs, vds, this.vsb, buf);
      else s.small(vgs, vds, this.vsb, buf);
      v[o + VGS + k] = vgs;
      v[o + JD + k] = buf[0];
      v[o + GM + k] = buf[1];
      v[o + GMID + k] = buf[0] > 0 ? buf[1] / buf[0] : Infinity;
    }
  }

  // gds and gmb at sample j (NaN until looked up; a NaN from the table is merely looked up again).
  private withSmall(j: number): void {
    const v = this.v;
    const o = this.o;
    if (!Number.isNaN(v[o + GDS + j])) return;
    const vgs = v[o + VGS + j];
    const r = this.slice.small(vgs, this.mode === 'diode' ? vgs : this.mode, this.vsb, buf);
    v[o + GDS + j] = r[2];
    v[o + GMB + j] = r[3];
  }

  /**
   * Where gm/ID falls through `target`, scanning down from sample `from`
   * (N − 1: the top of the sweep, strong inversion side): true with the cell in
   * `j`, `t`; false when it does not, or jd there is not positive.
   */
  atGmid(target: number, from = N - 1): boolean {
    const v = this.v;
    const g = this.o + GMID;
    for (let j = from; j >= 0; j--) {
      if (j < this.low) this.reach(j);
      const a = v[g + j];
      const b = v[g + j + 1];
      if (b < target && a >= target) {
        this.stop = j;
        this.j = j;
        this.t = Number.isFinite(a) ? (a - target) / (a - b) : 1;
        return this.value(JD) > 0;
      }
      if (b >= target) {
        this.stop = j;
        return false;
      }
    }
    this.stop = -1;
    return false;
  }

  // Linear between the samples of the last crossing (no closure: this runs for every option).
  private value(row: number): number {
    const v = this.v;
    const j = this.o + row + this.j;
    return v[j] + this.t * (v[j + 1] - v[j]);
  }

  /** VGS at the last crossing, V. */
  crossVgs(): number {
    return this.value(VGS);
  }

  /** jd (per width) at the last crossing, A/m. */
  crossJd(): number {
    return this.value(JD);
  }

  /** gm, gds, gmb (per width) at the last crossing into out[0..2]. */
  crossSmall(out: Float64Array): void {
    this.withSmall(this.j);
    this.withSmall(this.j + 1);
    out[0] = this.value(GM);
    out[1] = this.value(GDS);
    out[2] = this.value(GMB);
  }
}

/** Top sample index: where a scan over ascending gm/ID targets starts. */
export const SWEEP_TOP = N - 1;

/** A sweep over the slice's VGS window at VDS `mode` and `vsb`; null when the table does not cover it. */
export function sweepVgs(slice: LengthSlice, mode: VdsMode, vsb: number): Sweep | null {
  const win = vgsWindow(slice, mode, vsb);
  return win ? new Sweep(slice, mode, vsb, win[0], win[1]) : null;
}
