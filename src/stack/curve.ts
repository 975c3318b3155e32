import { StackwrightError } from '../errors.js';
import type { StackDevice, StackOp } from './types.js';
import { solveOperatingPoint } from './operating.js';
import { PackedOp, gdsAt, gmAt, gmbAt, nodeAt, packedOperatingPoint, packedRout } from './packed-op.js';
import { routAt } from './rout.js';
import { newtonStart } from './newton.js';
import { formatEng } from '../units/index.js';

/** One point of the I–V curve; `op` is null where the table cannot cover it. */
export interface CurveSample {
  v: number;
  i: number;
  rout: number;
  op: StackOp | null;
}

/**
 * The stack's I–V curve from v = 0 to `span` in `intervals` equal steps,
 * solved by continuation outwards from `anchor` (an operating point near the
 * design bias) so Newton starts close. Points the table cannot cover get
 * NaN current and Rout rather than failing the whole curve. With `lowest`,
 * the downward sweep stops after the first sample it accepts and the curve
 * starts there (callers that only need the top part skip the triode region).
 */
export function stackCurve(
  devices: readonly StackDevice[],
  gates: readonly number[],
  span: number,
  opts: { intervals?: number; anchor?: StackOp; lowest?: (s: CurveSample) => boolean } = {},
): CurveSample[] {
  const n = Math.max(Math.round(opts.intervals ?? 64), 2);
  if (!(span > 0)) throw new StackwrightError(`span must be positive, got ${formatEng(span, 'V', 4)}`, { kind: 'input' });
  const out: CurveSample[] = new Array(n + 1);
  const vAt = (j: number) => (span * j) / n;
  const start = opts.anchor ? Math.min(n, Math.max(0, Math.round((opts.anchor.v / span) * n))) : n;
  let prev: StackOp | undefined = opts.anchor;
  for (let j = start; j <= n; j++) prev = fill(j) ?? prev;
  prev = opts.anchor ?? out[start].op ?? undefined;
  let first = 0;
  for (let j = start - 1; j >= 0; j--) {
    prev = fill(j) ?? prev;
    if (opts.lowest?.(out[j])) {
      first = j;
      break;
    }
  }
  return first === 0 ? out : out.slice(first);

  function fill(j: number): StackOp | undefined {
    const v = vAt(j);
    out[j] = sampleAt(devices, gates, v, prev);
    return out[j].op ?? undefined;
  }
}

/** One curve sample at v, NaN where the table cannot cover it. */
export function sampleAt(devices: readonly StackDevice[], gates: readonly number[], v: number, guess?: StackOp): CurveSample {
  try {
    const op = solveNear(devices, gates, v, guess);
    // A packed point's current read from its array: the getter's call would box it (the CLI runs without inlining).
    if (op instanceof PackedOp) return { v, i: op.p[1], rout: packedRout(op), op };
    return { v, i: op.i, rout: routAt(op), op };
  } catch (e) {
    if (e instanceof StackwrightError && e.kind === 'range') return { v, i: NaN, rout: NaN, op: null };
    throw e;
  }
}

/**
 * The operating point at v, solved from a point nearby (see continued) when there is one, as solveOperatingPoint
 * (which throws kind 'range' where the table cannot cover it).
 */
export function solveNear(devices: readonly StackDevice[], gates: readonly number[], v: number, guess?: StackOp): StackOp {
  const n = devices.length;
  // One device, or bad input: the general solve (it says what is wrong).
  if (n < 2 || gates.length !== n || !(v >= 0) || !Number.isFinite(v)) return solveOperatingPoint(devices, gates, v, guess ? continued(guess, v) : undefined);
  // The start is written where the solver reads it (continueInto), and nothing but the packed answer is built.
  let i0 = 0;
  let count = 0;
  if (guess) {
    const start = newtonStart(n);
    count = Math.min(guess instanceof PackedOp ? guess.n + 1 : guess.nodes.length, start.length);
    i0 = continueInto(guess, v, start);
  }
  return packedOperatingPoint(devices, gates, v, i0, count);
}

// Within this distance of a solved point the tangent predicts the next one (Newton then needs fewer steps).
const TANGENT_SPAN = 0.25;

/**
 * Start of the solve at v from a solved point. Near it, the tangent of the solution path (Euler predictor of
 * continuation, common practice): dI/dV = 1/Rout and dx_k/dV = z_k/Rout, z_k the node voltages the Rout
 * recurrence gives for a 1 A test current. Farther, or without small-signal values: internal nodes barely move
 * in saturation, so keep them, shrinking the share above each node with v.
 */
function continued(op: StackOp, v: number): { i: number; nodes: number[] } {
  const count = op instanceof PackedOp ? op.n + 1 : op.nodes.length;
  const out = new Float64Array(count);
  const i = continueInto(op, v, out);
  const nodes = new Array<number>(count);
  for (let k = 0; k < count; k++) nodes[k] = out[k];
  return { i, nodes };
}

/** continued, writing the nodes into `out` (as many as the point has) and returning the current. */
function continueInto(op: StackOp, v: number, out: Float64Array): number {
  if (op instanceof PackedOp) return continuePacked(op, v, out);
  const n = op.nodes.length - 1;
  const dv = v - op.v;
  if (op.devices.length === n && n > 0 && Math.abs(dv) <= TANGENT_SPAN) {
    out[0] = 0;
    out[n] = v;
    let z = 0;
    let ok = true;
    for (let k = 0; k < n; k++) {
      const d = op.devices[k];
      if (!(d.gds > 0)) {
        ok = false;
        break;
      }
      z += (1 + (d.gm + d.gmb) * z) / d.gds;
      if (k < n - 1) out[k + 1] = z;
    }
    const rout = z;
    if (ok && rout > 0 && Number.isFinite(rout)) {
      for (let k = 1; k < n; k++) out[k] = Math.min(Math.max(op.nodes[k] + (dv * out[k]) / rout, out[k - 1]), v);
      return Math.max(op.i + dv / rout, 0.5 * op.i);
    }
  }
  const ratio = op.v > 0 ? Math.min(v / op.v, 1) : 1;
  const nodes = op.nodes;
  for (let k = 0; k <= n; k++) out[k] = Math.max(0, Math.min(nodes[k], v - (op.v - nodes[k]) * ratio));
  return op.i;
}

// The same, reading the packed values (v and I from the array: a getter's call would box them).
function continuePacked(op: PackedOp, v: number, out: Float64Array): number {
  const { n, p } = op;
  const v0 = p[0];
  const i0 = p[1];
  const x0 = nodeAt(0);
  const dv = v - v0;
  if (n > 0 && Math.abs(dv) <= TANGENT_SPAN) {
    out[0] = 0;
    out[n] = v;
    const gm = gmAt(n);
    const gds = gdsAt(n);
    const gmb = gmbAt(n);
    let z = 0;
    let ok = true;
    for (let k = 0; k < n; k++) {
      const g = p[gds + k];
      if (!(g > 0)) {
        ok = false;
        break;
      }
      z += (1 + (p[gm + k] + p[gmb + k]) * z) / g;
      if (k < n - 1) out[k + 1] = z;
    }
    const rout = z;
    if (ok && rout > 0 && Number.isFinite(rout)) {
      for (let k = 1; k < n; k++) out[k] = Math.min(Math.max(p[x0 + k] + (dv * out[k]) / rout, out[k - 1]), v);
      return Math.max(i0 + dv / rout, 0.5 * i0);
    }
  }
  const ratio = v0 > 0 ? Math.min(v / v0, 1) : 1;
  for (let k = 0; k <= n; k++) out[k] = Math.max(0, Math.min(p[x0 + k], v - (v0 - p[x0 + k]) * ratio));
  return i0;
}
