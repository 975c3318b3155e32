/**
 * Binary exchange file for the SciPy comparison, all little-endian:
 * int32 ndim, int32 npoints, int32 size of each axis, then float64 axes,
 * float64 values (row-major, first axis slowest), float64 points (npoints × ndim).
 */
import { readFileSync, writeFileSync } from 'node:fs';

export function writeGridFile(path: string, axes: readonly Float64Array[], values: Float64Array, points: Float64Array): void {
  const ndim = axes.length;
  const head = new Int32Array([ndim, points.length / ndim, ...axes.map((a) => a.length)]);
  const parts = [head, ...axes, values, points].map((a) => Buffer.from(a.buffer, a.byteOffset, a.byteLength));
  writeFileSync(path, Buffer.concat(parts));
}

/** A float64 array written by the python side (raw little-endian, no header). */
export function readFloat64(path: string): Float64Array {
  const b = readFileSync(path);
  const copy = new Uint8Array(b.byteLength);
  copy.set(b);
  return new Float64Array(copy.buffer);
}
