import { closeSync, fstatSync, readSync } from 'node:fs';
import { endianness } from 'node:os';
import { StackwrightError } from '../errors.js';
import { AxisLocator } from '../numeric/axis.js';
import { checkLayout } from './codec.js';
import { STORED } from './types.js';
import type { DeviceTable, StoredQuantity } from './types.js';
import { validateTable } from './validate.js';
import { openTableFile, readHeadFrom } from './store.js';

const LITTLE = endianness() === 'LE';

/**
 * The part of a stored table that a query at channel length `l` reads: the two
 * table lengths around `l` (l is the outermost axis, so each block's part is one
 * contiguous run of bytes). A one-off query such as `probe` then reads and checks
 * a quarter of the file or less. Returns undefined when `l` is not strictly inside
 * the length axis, so the caller loads the whole table and reports the range as usual.
 */
export function readTableAround(path: string, l: number): DeviceTable | undefined {
  const fd = openTableFile(path);
  try {
    const total = fstatSync(fd).size;
    const { header, dataStart } = readHeadFrom(fd, total, path);
    checkLayout(header, Math.max(0, total - dataStart), path);
    const lAxis = Float64Array.from(header.axes.l);
    if (!(lAxis.length > 1 && l > lAxis[0] && l < lAxis[lAxis.length - 1])) return undefined;
    const i0 = new AxisLocator(lAxis).locate(l);
    const m = header.axes.vgs.length * header.axes.vds.length * header.axes.vsb.length;
    const data: Partial<Record<StoredQuantity, Float64Array>> = {};
    for (const q of STORED) {
      const b = header.layout[q];
      if (!b) continue;
      const arr = new Float64Array(2 * m);
      const bytes = new Uint8Array(arr.buffer);
      const at = dataStart + b.offset + i0 * m * 8;
      let got = 0;
      while (got < bytes.length) {
        const n = readSync(fd, bytes, got, bytes.length - got, at + got);
        if (n === 0) throw new StackwrightError('file is truncated', { where: path });
        got += n;
      }
      if (!LITTLE) swapBytes(bytes); // tables are little-endian, Float64Array is host-endian
      data[q] = arr;
    }
    const table: DeviceTable = {
      meta: header.meta,
      axes: {
        l: lAxis.slice(i0, i0 + 2),
        vgs: Float64Array.from(header.axes.vgs),
        vds: Float64Array.from(header.axes.vds),
        vsb: Float64Array.from(header.axes.vsb),
      },
      data: data as DeviceTable['data'],
    };
    validateTable(table, path);
    return table;
  } finally {
    closeSync(fd);
  }
}

function swapBytes(b: Uint8Array): void {
  for (let i = 0; i < b.length; i += 8) b.subarray(i, i + 8).reverse();
}
