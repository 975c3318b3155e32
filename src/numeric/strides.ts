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

/**
 * Index along each axis of flat offset `flat` in a row-major block, as
 * numpy.unravel_index(flat, dims). `flat` is taken in [0, blockSize(dims)).
 */
export function rowMajorIndex(flat: number, dims: readonly number[]): number[] {
  const out = new Array<number>(dims.length);
  let rest = flat;
  for (let d = dims.length - 1; d >= 0; d--) {
    out[d] = rest % dims[d];
    rest = Math.floor(rest / dims[d]);
  }
  return out;
}

/**
 * Calls `visit(base, stride)` once for every 1-D line of a row-major block
 * along axis `along`: the line's points are at base + i·stride, i < dims[along].
 */
export function forEachLine(dims: readonly number[], along: number, visit: (base: number, stride: number) => void): void {
  const stride = rowMajorStrides(dims)[along];
  const block = stride * dims[along];
  const total = blockSize(dims);
  for (let outer = 0; outer < total; outer += block) {
    for (let inner = 0; inner < stride; inner++) visit(outer + inner, stride);
  }
}
