import type { LengthSlice } from '../../device/types.js';
import { vgsWindow, type VdsMode } from '../../stack/invert.js';

/** Per-width values sampled along VGS at one VDS (or diode) and VSB, for cheap screening. */
export interface Sweep {
  vgs: Float64Array;
  jd: Float64Array;
  gm: Float64Array;
  gds: Float64Array;
  gmb: Float64Array;
  gmid: Float64Array;
}

/** Values interpolated at one point of a sweep. */
export interface SweepPoint {
  vgs: number;
  jd: number;
  gm: number;
  gds: number;
  gmb: number;
}

const N = 64;
const buf = new Float64Array(4);

export function sweepVgs(slice: LengthSlice, mode: VdsMode, vsb: number): Sweep | null {
  const win = vgsWindow(slice, mode, vsb);
  if (!win) return null;
  const s: Sweep = {
    vgs: new Float64Array(N + 1), jd: new Float64Array(N + 1), gm: new Float64Array(N + 1),
    gds: new Float64Array(N + 1), gmb: new Float64Array(N + 1), gmid: new Float64Array(N + 1),
  };
  for (let j = 0; j <= N; j++) {
    const vgs = win[0] + ((win[1] - win[0]) * j) / N;
    const r = slice.small(vgs, mode === 'diode' ? vgs : mode, vsb, buf);
    s.vgs[j] = vgs;
    s.jd[j] = r[0];
    s.gm[j] = r[1];
    s.gds[j] = r[2];
    s.gmb[j] = r[3];
    s.gmid[j] = r[0] > 0 ? r[1] / r[0] : Infinity;
  }
  return s;
}

// No closure per point: this runs for every option the screen builds.
function at(a: Float64Array, j: number, t: number): number {
  return a[j] + t * (a[j + 1] - a[j]);
}

function lerp(s: Sweep, j: number, t: number): SweepPoint {
  return { vgs: at(s.vgs, j, t), jd: at(s.jd, j, t), gm: at(s.gm, j, t), gds: at(s.gds, j, t), gmb: at(s.gmb, j, t) };
}

/** Where gm/ID falls through `target`, scanning down from the top of the sweep (strong inversion side). */
export function atGmid(s: Sweep, target: number): SweepPoint | null {
  for (let j = N - 1; j >= 0; j--) {
    const a = s.gmid[j];
    const b = s.gmid[j + 1];
    if (b < target && a >= target) {
      const t = Number.isFinite(a) ? (a - target) / (a - b) : 1;
      const p = lerp(s, j, t);
      return p.jd > 0 ? p : null;
    }
    if (b >= target) return null;
  }
  return null;
}

/** Values at a given VGS (linear between samples), null outside the sweep. */
export function atVgs(s: Sweep, vgs: number): SweepPoint | null {
  const lo = s.vgs[0];
  const h = s.vgs[1] - lo;
  const x = (vgs - lo) / h;
  if (!(x >= 0 && x <= N)) return null;
  const j = Math.min(Math.floor(x), N - 1);
  return lerp(s, j, x - j);
}
