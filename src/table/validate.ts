import { StackwrightError } from '../errors.js';
import { showValue } from '../units/index.js';
import { rowMajorIndex } from '../numeric/strides.js';
import { AXES, STORED, UNITS, gridDims, tableSize } from './types.js';
import type { DeviceTable, TableMeta } from './types.js';

/** Kit and corner names become folder and file names, so keep them plain. */
const NAME = /^[A-Za-z0-9_+][A-Za-z0-9._+-]*$/;

/** A kit or corner name given by the user (`--kit`, `--corner`), checked before any work is done with it. */
export function checkPlainName(kind: 'kit' | 'corner', name: string, where: string): void {
  if (!NAME.test(name)) {
    throw new StackwrightError(`${kind} name ${JSON.stringify(name)} is not a plain name (letters, digits, . _ + -, not starting with . or -): it becomes a folder or file name`, { where });
  }
}

/** Checks meta fields a stored table relies on; `where` names the file or table. */
export function checkMeta(meta: TableMeta, where: string): void {
  const fail = (msg: string): never => {
    throw new StackwrightError(msg, { where });
  };
  if (meta === null || typeof meta !== 'object') fail('table header has no meta object');
  if (meta.format !== 'stackwright-table') fail(`meta.format is ${JSON.stringify(meta.format)}, expected "stackwright-table"`);
  if (meta.version !== 1) fail(`meta.version is ${JSON.stringify(meta.version)}, this build reads version 1`);
  if (typeof meta.kit !== 'string' || !NAME.test(meta.kit)) fail(`meta.kit ${JSON.stringify(meta.kit)} is not a plain name (letters, digits, . _ + -)`);
  if (meta.device !== 'n' && meta.device !== 'p') fail(`meta.device is ${JSON.stringify(meta.device)}, expected "n" or "p"`);
  if (typeof meta.corner !== 'string' || !NAME.test(meta.corner)) fail(`meta.corner ${JSON.stringify(meta.corner)} is not a plain name (letters, digits, . _ + -)`);
  if (!(typeof meta.referenceWidth === 'number' && meta.referenceWidth > 0 && Number.isFinite(meta.referenceWidth))) {
    fail(`meta.referenceWidth must be a positive number of metres, got ${JSON.stringify(meta.referenceWidth)}`);
  }
  if (!Array.isArray(meta.sources)) fail('meta.sources must be a list');
  if (meta.derived === null || typeof meta.derived !== 'object') fail('meta.derived must be an object');
}

/** Checks that each axis is finite and strictly increasing. */
export function checkAxes(axes: Record<string, ArrayLike<number>>, where: string): void {
  for (const a of AXES) {
    const v = axes[a];
    if (!v || typeof v.length !== 'number' || v.length < 1) {
      throw new StackwrightError(`axis ${a} is missing or empty`, { where });
    }
    for (let i = 0; i < v.length; i++) {
      if (typeof v[i] !== 'number' || !Number.isFinite(v[i])) {
        throw new StackwrightError(`axis ${a} point ${i} is not a finite number (${String(v[i])})`, { where });
      }
      if (i > 0 && !(v[i] > v[i - 1])) {
        throw new StackwrightError(`axis ${a} is not strictly increasing at point ${i} (${showValue(v[i - 1], UNITS[a])} then ${showValue(v[i], UNITS[a])})`, { where });
      }
    }
  }
  if (axes.l[0] <= 0) throw new StackwrightError(`axis l must be positive lengths, starts at ${showValue(axes.l[0], 'm')}`, { where });
}

/** Full check of an in-memory table: meta, axes, and every data block's size and finiteness. */
export function validateTable(table: DeviceTable, where: string): void {
  checkMeta(table.meta, where);
  checkAxes(table.axes, where);
  const size = tableSize(table.axes);
  if (!table.data || !(table.data.id instanceof Float64Array)) throw new StackwrightError('table has no id data', { where });
  for (const key of Object.keys(table.data)) {
    if (!(STORED as readonly string[]).includes(key)) {
      throw new StackwrightError(`unknown quantity "${key}" (known: ${STORED.join(', ')})`, { where });
    }
    const arr = table.data[key as keyof DeviceTable['data']];
    if (!(arr instanceof Float64Array)) throw new StackwrightError(`quantity ${key} is not a Float64Array`, { where });
    if (arr.length !== size) {
      throw new StackwrightError(`quantity ${key} has ${arr.length} values, the axes need ${size}`, { where });
    }
    const bad = firstNonFinite(arr);
    if (bad >= 0) throw new StackwrightError(`quantity ${key} is not finite at ${pointName(table, bad)}`, { where });
  }
}

function firstNonFinite(a: Float64Array): number {
  // The typed array's own search first (a builtin: a table load runs this cold, where a loop is interpreted).
  if (!a.includes(NaN) && !a.includes(Infinity) && !a.includes(-Infinity)) return -1;
  for (let i = 0; i < a.length; i++) if (!Number.isFinite(a[i])) return i;
  return -1;
}

/** Grid coordinates of a flat index, for messages. */
export function pointName(table: Pick<DeviceTable, 'axes'>, flat: number): string {
  const { l, vgs, vds, vsb } = table.axes;
  const [il, ig, id, is] = rowMajorIndex(flat, gridDims(table.axes));
  return `l=${l[il]} vgs=${vgs[ig]} vds=${vds[id]} vsb=${vsb[is]}`;
}
