import { StackwrightError } from '../errors.js';
import { listKits, listTables, loadTable } from '../table/store.js';
import type { DeviceTable, Polarity } from '../table/types.js';
import { tablesDirFor } from '../table/locate.js';
import { kitAccessFromTables } from './kit-tables.js';
import type { KitAccess } from './kit.js';

/** A kit's tables, loaded, with what the search needs. */
export interface Kit extends KitAccess {
  /** Folder the tables came from. */
  dir: string;
  table(device: Polarity, corner: string): DeviceTable;
}

/**
 * Load every table of a kit. Without `tables`, looks in ./tables and then in the
 * package's bundled demo tables.
 */
export function loadKit(kit: string, opts: { tables?: string } = {}): Kit {
  const dir = tablesDirFor(kit, opts.tables);
  const names = listTables(dir, kit);
  if (names.length === 0) {
    const have = listKits(dir);
    throw new StackwrightError(`kit ${kit} not found in ${dir}` + (have.length ? ` (has ${have.join(', ')})` : ' (no kits there)'));
  }
  const tables = names.map((name) => loadTable(dir, kit, name.slice(0, 1) as Polarity, name.slice(2)));
  const access = kitAccessFromTables(tables);
  return {
    ...access,
    dir,
    table: (device, corner) => loadTable(dir, kit, device, corner),
  };
}
