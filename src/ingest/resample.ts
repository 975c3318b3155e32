import { StackwrightError } from '../errors.js';
import { formatEng, showValue } from '../units/index.js';
import { snapVolt } from './pool.js';
import { blockSize, rowMajorIndex, rowMajorStrides } from '../numeric/strides.js';
import { hermiteAt, pchipSlopes } from '../numeric/pchip.js';

const NAMES = ['vgs', 'vds', 'vsb'] as const;

/**
 * Missing points in a row of a length's own sweep that are still filled; a longer run is refused: the curve
 * through its ends says little about what lies between (two missing 50 mV points near threshold were already
 * filled 5 % off, tests/ingest.test.ts), and a lost run of a sweep is to be simulated, not guessed.
 */
export const MAX_HOLE = 1;

function median(a: number[]): number {
  const s = [...a].sort((x, y) => x - y);
  return s[s.length >> 1];
}

/**
 * One axis for all lengths: their own values when every length has the same
 * ones; else, inside the intersection of their ranges, the points of a length
 * that has all the others' points; else a uniform axis over that intersection
 * at the finest typical (median) step.
 */
export function commonAxis(per: Array<{ l: number; axis: Float64Array }>, name: string, file: string): { axis: Float64Array; exact: boolean } {
  const first = per[0].axis;
  if (per.every((p) => p.axis.length === first.length && p.axis.every((v, i) => v === first[i]))) return { axis: first, exact: true };
  const lo = Math.max(...per.map((p) => p.axis[0]));
  const hi = Math.min(...per.map((p) => p.axis[p.axis.length - 1]));
  if (lo > hi) {
    const spans = per.map((p) => `L=${formatEng(p.l, 'm', 4)} ${showValue(p.axis[0], 'V')}..${showValue(p.axis[p.axis.length - 1], 'V')}`).join(', ');
    throw new StackwrightError(`the lengths share no ${name} range (${spans})`, { where: file });
  }
  // A length whose own points include every other length's (inside the shared range) already is the grid.
  const inside = (p: { axis: Float64Array }) => Array.from(p.axis).filter((v) => v >= lo && v <= hi);
  const union = [...new Set(per.flatMap(inside))].sort((a, b) => a - b);
  if (per.some((p) => inside(p).length === union.length)) return { axis: Float64Array.from(union), exact: false };
  const steps = per.filter((p) => p.axis.length > 1).map((p) => median(Array.from(p.axis.subarray(1), (v, i) => v - p.axis[i])));
  const step = steps.length ? Math.min(...steps) : 0;
  const n = step > 0 ? Math.max(1, Math.round((hi - lo) / step)) : 0;
  const axis = new Float64Array(n + 1);
  for (let k = 0; k <= n; k++) axis[k] = snapVolt(n === 0 ? lo : lo + ((hi - lo) * k) / n);
  return { axis, exact: false };
}

/**
 * Resample one length's (vgs, vds, vsb) tensor (NaN = missing point) onto the
 * target axes, one axis at a time with PCHIP through the points each line has.
 * Never extrapolates: a target outside a line's samples is an error.
 */
export function resampleLength(
  tensor: Float64Array,
  from: readonly [Float64Array, Float64Array, Float64Array],
  to: readonly [Float64Array, Float64Array, Float64Array],
  logVgs: boolean,
  l: number,
  file: string,
): Float64Array {
  let cur = tensor;
  const axes: Float64Array[] = [...from];
  for (let k = 0; k < 3; k++) {
    cur = resampleAxis(cur, axes, k, to[k], k === 0 && logVgs, l, file);
    axes[k] = to[k];
  }
  for (let i = 0; i < cur.length; i++) {
    if (cur[i] !== cur[i]) throw new StackwrightError(`L=${formatEng(l, 'm', 4)}: bias points missing around ${pointAt(to, i)}; cannot fill them without extrapolating`, { where: file });
  }
  return cur;
}

function pointAt(axes: readonly Float64Array[], flat: number): string {
  const [ig, id, is] = rowMajorIndex(flat, axes.map((a) => a.length));
  return `vgs=${showValue(axes[0][ig], 'V')} vds=${showValue(axes[1][id], 'V')} vsb=${showValue(axes[2][is], 'V')}`;
}

function resampleAxis(src: Float64Array, axes: Float64Array[], k: number, target: Float64Array, log: boolean, l: number, file: string): Float64Array {
  const dims = axes.map((a) => a.length);
  const n = dims[k];
  const stride = rowMajorStrides(dims)[k];
  const outer = blockSize(dims.slice(0, k));
  const m = target.length;
  const out = new Float64Array(outer * m * stride);
  const xs: number[] = [];
  const ys: number[] = [];
  for (let o = 0; o < outer; o++) {
    for (let inner = 0; inner < stride; inner++) {
      xs.length = 0;
      ys.length = 0;
      let positive = true;
      let last = -1;
      for (let i = 0; i < n; i++) {
        const y = src[(o * n + i) * stride + inner];
        if (y === y) {
          if (last >= 0 && i - last - 1 > MAX_HOLE) {
            const line = lineLabel(axes, k, o, inner, dims);
            throw new StackwrightError(
              `L=${formatEng(l, 'm', 4)}${line}: no ${NAMES[k]} samples between ${showValue(axes[k][last], 'V')} and ${showValue(axes[k][i], 'V')} (${i - last - 1} points in a row missing); only a single missing point is filled: simulate those bias points`,
              { where: file },
            );
          }
          last = i;
          xs.push(axes[k][i]);
          ys.push(y);
          if (!(y > 0)) positive = false;
        }
      }
      const put = (j: number, v: number) => (out[(o * m + j) * stride + inner] = v);
      if (xs.length === 0) {
        for (let j = 0; j < m; j++) put(j, NaN);
        continue;
      }
      if (target[0] < xs[0] || target[m - 1] > xs[xs.length - 1]) {
        const line = lineLabel(axes, k, o, inner, dims);
        throw new StackwrightError(
          `L=${formatEng(l, 'm', 4)}${line}: ${NAMES[k]} samples span ${showValue(xs[0], 'V')}..${showValue(xs[xs.length - 1], 'V')} but the common grid needs ${showValue(target[0], 'V')}..${showValue(target[m - 1], 'V')}; refusing to extrapolate`,
          { where: file },
        );
      }
      const useLog = log && positive;
      const yy = useLog ? ys.map(Math.log) : ys;
      const d = pchipSlopes(xs, yy);
      let p = 0;
      for (let j = 0; j < m; j++) {
        // Samples that fall on the target grid are kept bit for bit.
        while (p < xs.length - 1 && xs[p] < target[j]) p++;
        if (xs[p] === target[j]) put(j, ys[p]);
        else put(j, useLog ? Math.exp(hermiteAt(xs, yy, d, target[j])) : hermiteAt(xs, yy, d, target[j]));
      }
    }
  }
  return out;
}

function lineLabel(axes: Float64Array[], k: number, o: number, inner: number, dims: number[]): string {
  const idx = rowMajorIndex((o * dims[k]) * rowMajorStrides(dims)[k] + inner, dims);
  const parts = [0, 1, 2].filter((a) => a !== k && dims[a] > 1).map((a) => `${NAMES[a]}=${showValue(axes[a][idx[a]], 'V')}`);
  return parts.length ? ` at ${parts.join(' ')}` : '';
}
