import { designIndex, swingOnGrid } from '../stack/index.js';
import type { BatchColumns } from './batch.js';
import { LOOP_RANGE, LOOP_SCALE } from './stage-circuit.js';
import type { StageResponsePoint, StageSimulatedFigures, StageSimulatedPoint } from './stage-types.js';

/** Output step of the reported simulated curve, V. */
export const STAGE_CURVE_STEP = 0.02;
/** Share of the loop's range beyond which the output is not held (the stage cannot reach it). */
const HELD = 0.95;

function lerp(xs: ArrayLike<number>, ys: ArrayLike<number>, x: number): number {
  let k = 0;
  while (k < xs.length - 2 && xs[k + 1] < x) k++;
  const t = (x - xs[k]) / (xs[k + 1] - xs[k]);
  return ys[k] + Math.min(Math.max(t, 0), 1) * (ys[k + 1] - ys[k]);
}

/**
 * Unity-gain frequency of |H| = |v(out)/v(inp)| from an AC analysis: the first
 * fall through 1, interpolated linearly in log |H| against log f (exact on a
 * single-pole slope); 0 when |H| < 1 from the first frequency, null when it
 * never falls to 1 in the band.
 */
export function unityGainFrequency(ac: NonNullable<BatchColumns['ac']>): number | null {
  const mag = (k: number) => acGain(ac, k);
  const n = ac.freq.length;
  if (n === 0) return null;
  let prev = mag(0);
  if (!(prev >= 1)) return 0;
  for (let k = 1; k < n; k++) {
    const m = mag(k);
    if (m < 1) {
      const t = Math.log(prev) / (Math.log(prev) - Math.log(m));
      return Math.exp(Math.log(ac.freq[k - 1]) + t * (Math.log(ac.freq[k]) - Math.log(ac.freq[k - 1])));
    }
    prev = m;
  }
  return null;
}

/** |v(out)/v(inp)| at the AC analysis' k-th frequency (vectors: output, then input). */
function acGain(ac: NonNullable<BatchColumns['ac']>, k: number): number {
  return Math.hypot(ac.re[0][k], ac.im[0][k]) / Math.hypot(ac.re[1][k], ac.im[1][k]);
}

/** The AC analysis as reported points (finite ones only); empty without one. */
function responseOf(ac: BatchColumns['ac']): StageResponsePoint[] {
  const out: StageResponsePoint[] = [];
  if (!ac) return out;
  for (let k = 0; k < ac.freq.length; k++) {
    const gain = acGain(ac, k);
    if (Number.isFinite(gain) && Number.isFinite(ac.freq[k])) out.push({ f: ac.freq[k], gain });
  }
  return out;
}

/**
 * A stage's simulated figures from its held sweep: the points where the loop
 * holds the output (vout ascending), the gain |dvout/dvin| by central
 * differences, the gain at the design-point output, and the swing by the
 * README's definition (widest interval around the design point with gain ≥
 * target). Null when the stage cannot hold its design point at all. With an
 * AC analysis (gbw target) also the unity-gain frequency at the design point.
 */
export function stageFigures(data: BatchColumns, vin0: number, t: { gain: number; output: number }, corner: string): StageSimulatedFigures {
  const vout: number[] = [];
  const vin: number[] = [];
  const xmax = LOOP_RANGE * LOOP_SCALE;
  for (let j = 0; j < data.sweep.length; j++) {
    const x = data.columns[1][j];
    if (Math.abs(x) < HELD * xmax && (vout.length === 0 || data.columns[0][j] > vout[vout.length - 1])) {
      vout.push(data.columns[0][j]);
      vin.push(vin0 + x / LOOP_SCALE);
    }
  }
  const n = vout.length;
  const gbw = data.ac ? unityGainFrequency(data.ac) : null;
  const response = responseOf(data.ac);
  if (n < 3 || t.output < vout[0] || t.output > vout[n - 1]) {
    return { corner, gain: 0, vlow: null, vhigh: null, swing: 0, vin: vin0, gbw, curve: [], response };
  }
  const gains = new Float64Array(n);
  for (let j = 1; j < n - 1; j++) {
    const dv = Math.abs(vin[j + 1] - vin[j - 1]);
    gains[j] = dv > 0 ? (vout[j + 1] - vout[j - 1]) / dv : 0;
  }
  const j0 = designIndex(vout, t.output);
  const s = swingOnGrid(vout, gains, j0, t.gain);
  const curve: StageSimulatedPoint[] = [];
  // Grid points as k·step (no accumulated rounding in the reported voltages).
  for (let k = Math.ceil(vout[1] / STAGE_CURVE_STEP); k * STAGE_CURVE_STEP <= vout[n - 2]; k++) {
    const v = Number((k * STAGE_CURVE_STEP).toFixed(9));
    curve.push({ vout: v, vin: lerp(vout, vin, v), gain: lerp(vout, gains, v) });
  }
  return {
    corner,
    gain: lerp(vout, gains, t.output),
    vlow: s ? s.vlow : null,
    vhigh: s ? s.vhigh : null,
    swing: s ? s.vhigh - s.vlow : 0,
    vin: lerp(vout, vin, t.output),
    gbw,
    curve,
    response,
  };
}
