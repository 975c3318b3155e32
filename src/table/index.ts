export * from './types.js';
export { AxisLocator } from '../numeric/axis.js';
export { RegularGridInterpolator } from '../numeric/grid-interpolator.js';
export type { GridOptions, OutOfBounds } from '../numeric/grid-interpolator.js';
export { rangeError } from '../numeric/range-error.js';
export { tableLabel } from './label.js';
export { validateTable, checkAxes, checkMeta, checkPlainName, pointName } from './validate.js';
export { MAGIC, encodeTable, decodeTable, decodeHeader } from './codec.js';
export type { TableHeader, BlockLayout } from './codec.js';
export {
  TABLE_EXT, tablePath, writeTable, readTable, readTableHeader, listKits, listTables, loadTable, clearTableCache,
} from './store.js';
export { kitInventory } from './inventory.js';
export { readTableAround } from './partial.js';
export type { KitSummary, TableSummary, BrokenTable } from './inventory.js';
