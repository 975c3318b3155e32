/**
 * Row-major (C order, last axis fastest) layout of an N-d block, as NumPy's
 * `ndarray.strides / itemsize` for a C-contiguous array.
 *
 * @param dims  number of points along each axis, slowest first
 * @returns     element stride of each axis (stride[last] = 1)
 */
export function rowMajorStrides(dims: readonly number[]): number[] {
  const out = new Array<number>(dims.length);
  let s = 1;
  for (let d = dims.length - 1; d >= 0; d--) {
    out[d] = s;
    s *= dims[d];
  }
  return out;
}

/** Number of elements of a block with these dims (1 for none). */
export function blockSize(dims: readonly number[]): number {
  return dims.reduce((a, b) => a * b, 1);
}
