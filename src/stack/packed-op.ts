import type { DeviceBias, StackOp } from './types.js';
import type { Solution } from './newton.js';

/**
 * A solved operating point kept in one array of numbers: the nodes x_0..x_N, then each device's VGS, VDS, VSB,
 * ID, gm, gds and gmb (one block of N per quantity). Most DC solves only serve as the start of the next one, so
 * `nodes` and `devices` are built on first use: an unread point costs one allocation of unboxed numbers instead
 * of an object with boxed numbers per device.
 */
export class PackedOp implements StackOp {
  private nodesCache: number[] | undefined = undefined;
  private devicesCache: DeviceBias[] | undefined = undefined;

  constructor(
    readonly v: number,
    readonly i: number,
    /** Number of devices. */
    readonly n: number,
    /** The packed values (layout above). */
    readonly p: readonly number[],
  ) {}

  get nodes(): number[] {
    if (this.nodesCache === undefined) this.nodesCache = this.p.slice(0, this.n + 1);
    return this.nodesCache;
  }

  get devices(): DeviceBias[] {
    if (this.devicesCache === undefined) {
      const { n, p } = this;
      const out: DeviceBias[] = new Array(n);
      const b = n + 1;
      for (let k = 0; k < n; k++) {
        out[k] = { vgs: p[b + k], vds: p[b + n + k], vsb: p[b + 2 * n + k], id: p[b + 3 * n + k], gm: p[b + 4 * n + k], gds: p[b + 5 * n + k], gmb: p[b + 6 * n + k] };
      }
      this.devicesCache = out;
    }
    return this.devicesCache;
  }
}

/** Offsets of gm, gds and gmb of device k in a PackedOp's array. */
export const gmAt = (n: number, k: number): number => n + 1 + 4 * n + k;
export const gdsAt = (n: number, k: number): number => n + 1 + 5 * n + k;
export const gmbAt = (n: number, k: number): number => n + 1 + 6 * n + k;

// One array of doubles per length, copied: the copy is born with unboxed storage of the right size.
const templates: number[][] = [];

/** The solution of a DC solve (valid until the next one) as a PackedOp of its own. */
export function packOp(n: number, v: number, i: number, s: Solution): PackedOp {
  const len = 8 * n + 1;
  let t = templates[n];
  if (t === undefined) templates[n] = t = new Array<number>(len).fill(0.5);
  const p = t.slice();
  for (let k = 0; k <= n; k++) p[k] = s.x[k];
  let o = n + 1;
  for (let k = 0; k < n; k++) p[o + k] = s.vgs[k];
  o += n;
  for (let k = 0; k < n; k++) p[o + k] = s.vds[k];
  o += n;
  for (let k = 0; k < n; k++) p[o + k] = s.vsb[k];
  o += n;
  for (let k = 0; k < n; k++) p[o + k] = s.id[k];
  o += n;
  for (let k = 0; k < n; k++) p[o + k] = s.gm[k];
  o += n;
  for (let k = 0; k < n; k++) p[o + k] = s.gds[k];
  o += n;
  for (let k = 0; k < n; k++) p[o + k] = s.gmb[k];
  return new PackedOp(v, i, n, p);
}
