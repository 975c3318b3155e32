import type { DeviceBias, StackDevice, StackOp } from './types.js';
import { emptyBias, evalDevice } from './evaluate-device.js';
import { covers, outsideSlice } from './range.js';
import { StackwrightError } from '../errors.js';
import { fallingNewton } from '../numeric/safe-newton.js';
import { CurrentLine } from './current-line.js';

/** Outcome of stacking devices for a trial current: the voltage needed, or which way the current is off. */
type Trial = { kind: 'ok'; total: number } | { kind: 'high' | 'low'; at: number };

const b = emptyBias();

// The current asked for over the device's, as its VDS rises at a fixed gate and source, as a difference.
const shortfall = new CurrentLine();

/**
 * Drain voltage that lets device `d` carry `i` at the given gate and source
 * (jd rises monotonically with VDS): where the slice has exact slopes, Newton from `guess` (the device's VDS at the
 * previous trial current) and, failing that, from the secant between the ends; else (or should Newton fail)
 * bisection. 'high': the current cannot flow within `budget`; 'low': the gate drive is above the table, so the
 * trial current is below the solution.
 */
function vdsFor(d: StackDevice, vgs: number, vsb: number, i: number, budget: number, guess: number): number | 'high' | 'low' {
  const r = d.slice.range;
  if (vsb > r.vsb[1] || vgs < r.vgs[0]) return 'high';
  if (vgs > r.vgs[1]) return 'low';
  let lo = Math.max(r.vds[0], 0);
  let hi = Math.min(r.vds[1], budget);
  if (hi < lo) return 'high';
  const f = (vds: number) => d.w * d.slice.jd(vgs, vds, vsb);
  if (!covers(d.slice, vgs, hi, vsb)) return 'high';
  if (d.slice.jdSlopes && guess > lo && guess < hi) {
    // Late in the outer bisection the trial currents differ little, so Newton from the last VDS lands in a lookup or
    // two; a root it reaches is the only one in [lo, hi] (jd rises with VDS), so the ends need no samples.
    const x = fallingNewton(shortfall.of(d.slice, d.w, i, false, false).along(vgs, 0, vsb, 0, 1, 0), lo, hi, 1e-13, guess, true);
    if (!Number.isNaN(x)) return x;
  }
  const fHi = f(hi);
  if (fHi < i) return 'high';
  const fLo = f(lo);
  if (fLo > i) return 'low';
  if (d.slice.jdSlopes) {
    // At a fixed gate and source jd is linear in VDS within a table cell (bilinear interpolation there), so Newton
    // from the secant between the ends takes a few lookups where bisection to 1e-13 V takes about forty.
    const g = shortfall.of(d.slice, d.w, i, false, false).along(vgs, 0, vsb, 0, 1, 0);
    const x = fHi > fLo ? fallingNewton(g, lo, hi, 1e-13, lo + ((hi - lo) * (i - fLo)) / (fHi - fLo)) : NaN;
    if (!Number.isNaN(x)) return x;
  }
  for (let it = 0; it < 60 && hi - lo > 1e-13; it++) {
    const mid = 0.5 * (lo + hi);
    if (f(mid) < i) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/** The stack's nodes for a trial current; `last` holds each device's VDS of the previous trial (NaN: none) and is updated. */
function trial(devices: readonly StackDevice[], gates: readonly number[], v: number, i: number, nodes: number[], last: Float64Array): Trial {
  let x = 0;
  nodes[0] = 0;
  for (let k = 0; k < devices.length; k++) {
    const vds = vdsFor(devices[k], gates[k] - x, x, i, v - x + 1e-12, last[k]);
    if (vds === 'high' || vds === 'low') return { kind: vds, at: k };
    last[k] = vds;
    x += vds;
    nodes[k + 1] = x;
  }
  return { kind: 'ok', total: x };
}

/**
 * Robust DC solve: bisection on the current (the voltage a current needs rises
 * monotonically with it), inner monotone solves for each VDS. Slow but sure;
 * used when Newton fails. Throws kind 'range' when the table cannot cover v.
 */
export function bracketedOperatingPoint(devices: readonly StackDevice[], gates: readonly number[], v: number): StackOp {
  const n = devices.length;
  const d0 = devices[0];
  const vTop = Math.min(v, d0.slice.range.vds[1]);
  if (!evalDevice(d0, gates[0], vTop, 0, b)) throw outsideSlice(d0.slice, gates[0], vTop, 0, 'bottom device');
  let lo = 0;
  let hi = b.id;
  const nodes = new Array<number>(n + 1).fill(0);
  if (hi <= 0) return finish(devices, gates, v, 0, lin(n, v));
  const last = new Float64Array(n).fill(NaN);
  for (let it = 0; it < 200 && hi - lo > 1e-14 * hi; it++) {
    const mid = 0.5 * (lo + hi);
    const t = trial(devices, gates, v, mid, nodes, last);
    if (t.kind === 'low' || (t.kind === 'ok' && t.total < v)) lo = mid;
    else hi = mid;
    if (t.kind === 'high' && t.at === n - 1 && nodes[n - 1] > devices[n - 1].slice.range.vsb[1] && topShortOfV(devices[n - 1], gates[n - 1], v, mid)) {
      throw edgeError(devices, gates, nodes, n - 1, v);
    }
  }
  const t = trial(devices, gates, v, lo, nodes, last);
  if (t.kind !== 'ok' || Math.abs(t.total - v) > 1e-6) {
    // The solution sits against a table edge (vsb, vgs or vds): not coverable.
    const up = trial(devices, gates, v, hi, nodes, last);
    throw edgeError(devices, gates, nodes, up.kind === 'ok' ? devices.length - 1 : up.at, v);
  }
  nodes[n] = v;
  return finish(devices, gates, v, lo, nodes);
}

/**
 * The top device's source ran beyond the table's VSB at current i, and even with its source on that edge it carries i
 * with its drain more than the solve's tolerance below v: every current below i then leaves the stack short of v (the
 * nodes rise with the current, and the top needs less VDS at a lower current, a lower source and a higher gate), so the
 * bisection can only end at the VSB edge, not coverable. Spares the forty-odd trials that would show it.
 */
function topShortOfV(top: StackDevice, gate: number, v: number, i: number): boolean {
  const x = top.slice.range.vsb[1];
  const vds = vdsFor(top, gate - x, x, i, v - x + 1e-12, NaN);
  return typeof vds === 'number' && x + vds < v - 2e-6;
}

function lin(n: number, v: number): number[] {
  return Array.from({ length: n + 1 }, (_, k) => (v * k) / n);
}

// The solution converged onto a table edge: name the device and the axis it runs into.
function edgeError(devices: readonly StackDevice[], gates: readonly number[], nodes: number[], k: number, v: number): StackwrightError {
  const r = devices[k].slice.range;
  const vsb = nodes[k];
  const vgs = gates[k] - vsb;
  const near = (x: number, edge: number) => Math.abs(x - edge) < 1e-6;
  let axis = 'vds';
  let lim = r.vds;
  if (vsb >= r.vsb[1] || near(vsb, r.vsb[1])) [axis, lim] = ['vsb', r.vsb];
  else if (vgs <= r.vgs[0] || near(vgs, r.vgs[0]) || vgs >= r.vgs[1] || near(vgs, r.vgs[1])) [axis, lim] = ['vgs', r.vgs];
  return new StackwrightError(
    `stack at v = ${v.toFixed(3)} V needs device ${k + 1} (L = ${(devices[k].slice.l * 1e6).toPrecision(4)} µm) beyond the table's ${axis} range ${lim[0]}..${lim[1]} V`,
    { kind: 'range' },
  );
}

function finish(devices: readonly StackDevice[], gates: readonly number[], v: number, i: number, nodes: number[]): StackOp {
  const out: DeviceBias[] = [];
  for (let k = 0; k < devices.length; k++) {
    const e = emptyBias();
    const vgs = gates[k] - nodes[k];
    const vds = nodes[k + 1] - nodes[k];
    if (!evalDevice(devices[k], vgs, vds, nodes[k], e)) throw outsideSlice(devices[k].slice, vgs, vds, nodes[k], `device ${k + 1}`);
    out.push(e);
  }
  return { v, i, nodes, devices: out };
}
