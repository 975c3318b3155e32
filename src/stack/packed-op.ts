import type { DeviceBias, StackDevice, StackOp } from './types.js';
import { newtonSolve, solutionOf } from './newton.js';
import { bracketedOperatingPoint } from './bracketed.js';
import { doubles } from './doubles.js';

/**
 * A solved operating point kept in one array of unboxed numbers: v, I, the nodes x_0..x_N, then each device's
 * gate, ID, gm, gds and gmb (one block of N per quantity). Most DC solves only serve as the start of the next one,
 * so `nodes` and `devices` are built on first read, and a device's values are read from the array: a point costs
 * one array of numbers instead of an object with a boxed number per value. A device's VGS, VDS and VSB are not
 * stored: the solve's lookups took them as gate − x_k, x_{k+1} − x_k and x_k, which give the same numbers again.
 */
export class PackedOp implements StackOp {
  private nodesCache: number[] | undefined = undefined;
  private devicesCache: DeviceBias[] | undefined = undefined;

  constructor(
    /** Number of devices. */
    readonly n: number,
    /** The packed values (layout above). */
    readonly p: readonly number[],
  ) {}

  get v(): number {
    return this.p[0];
  }

  get i(): number {
    return this.p[1];
  }

  get nodes(): number[] {
    if (this.nodesCache === undefined) this.nodesCache = this.p.slice(2, this.n + 3);
    return this.nodesCache;
  }

  get devices(): DeviceBias[] {
    if (this.devicesCache === undefined) {
      const out: DeviceBias[] = new Array(this.n);
      for (let k = 0; k < this.n; k++) out[k] = new PackedBias(this.p, k, this.n);
      this.devicesCache = out;
    }
    return this.devicesCache;
  }
}

/** One device's values in a PackedOp's array (read there, nothing copied). */
class PackedBias implements DeviceBias {
  constructor(
    private readonly p: readonly number[],
    /** The device's index. */
    private readonly k: number,
    private readonly n: number,
  ) {}

  get vgs(): number {
    return this.p[gateAt(this.n) + this.k] - this.p[nodeAt(this.k)];
  }

  get vds(): number {
    return this.p[nodeAt(this.k + 1)] - this.p[nodeAt(this.k)];
  }

  get vsb(): number {
    return this.p[nodeAt(this.k)];
  }

  get id(): number {
    return this.p[idAt(this.n) + this.k];
  }

  get gm(): number {
    return this.p[gmAt(this.n) + this.k];
  }

  get gds(): number {
    return this.p[gdsAt(this.n) + this.k];
  }

  get gmb(): number {
    return this.p[gmbAt(this.n) + this.k];
  }
}

/** Index of node k in a PackedOp's array. */
export const nodeAt = (k: number): number => 2 + k;
/**
 * Indices of the gate, ID, gm, gds and gmb of device 0 in a PackedOp's array of n devices (device k's are k on).
 * Hot loops take the offset once: a call per index costs a call each (the CLI runs without inlining).
 */
const gateAt = (n: number): number => n + 3;
const idAt = (n: number): number => 2 * n + 3;
export const gmAt = (n: number): number => 3 * n + 3;
export const gdsAt = (n: number): number => 4 * n + 3;
export const gmbAt = (n: number): number => 5 * n + 3;

/**
 * The DC solve of a chain of two or more devices from a start (current `i0`, the first `count` nodes written into
 * newtonStart(n), the rest spread evenly): Newton into the solver's working arrays, packed when it converges, else
 * the bracketed solve. Throws kind 'range' when the table cannot cover v (as solveOperatingPoint, which checks the
 * input first).
 */
export function packedOperatingPoint(devices: readonly StackDevice[], gates: readonly number[], v: number, i0: number, count: number): StackOp {
  const n = devices.length;
  const i = newtonSolve(devices, gates, v, i0, count);
  if (Number.isNaN(i)) return bracketedOperatingPoint(devices, gates, v);
  const s = solutionOf(n);
  const p = doubles(6 * n + 3);
  p[0] = v;
  p[1] = i;
  for (let k = 0; k <= n; k++) p[2 + k] = s.x[k];
  let o = n + 3;
  for (let k = 0; k < n; k++) p[o + k] = gates[k];
  o += n;
  for (let k = 0; k < n; k++) p[o + k] = s.id[k];
  o += n;
  for (let k = 0; k < n; k++) p[o + k] = s.gm[k];
  o += n;
  for (let k = 0; k < n; k++) p[o + k] = s.gds[k];
  o += n;
  for (let k = 0; k < n; k++) p[o + k] = s.gmb[k];
  return new PackedOp(n, p);
}

/** routOf over a PackedOp's devices (the same recurrence, the same order of operations). */
export function packedRout(op: PackedOp): number {
  const { n, p } = op;
  const gm = gmAt(n);
  const gds = gdsAt(n);
  const gmb = gmbAt(n);
  let vs = 0;
  for (let k = 0; k < n; k++) {
    const g = p[gds + k];
    if (!(g > 0)) return Infinity;
    vs += (1 + (p[gm + k] + p[gmb + k]) * vs) / g;
  }
  return vs;
}
