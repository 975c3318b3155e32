import { StackwrightError } from '../errors.js';
import { listKits, listTables, loadTable, readTableHeader, tablePath } from '../table/store.js';
import type { DeviceTable, Polarity } from '../table/types.js';
import { tablesDirFor } from '../table/locate.js';
import { kitAccessFromSources } from './kit-tables.js';
import type { KitAccess } from './kit.js';

/** A kit's tables, loaded, with what the search needs. */
export interface Kit extends KitAccess {
  /** Folder the tables came from. */
  dir: string;
  table(device: Polarity, corner: string): DeviceTable;
}

/**
 * A kit's tables by name; each table is read when first needed (sizing at tt
 * reads only the tt tables it uses). Without `tables`, looks in ./tables and
 * then in the package's bundled demo tables.
 */
export function loadKit(kit: string, opts: { tables?: string } = {}): Kit {
  const dir = tablesDirFor(kit, opts.tables);
  const names = listTables(dir, kit);
  if (names.length === 0) {
    const have = listKits(dir);
    throw new StackwrightError(`kit ${kit} not found in ${dir}` + (have.length ? ` (has ${have.join(', ')})` : ' (no kits there)'));
  }
  const sources = names.map((name) => {
    const device = name.slice(0, 1) as Polarity;
    const corner = name.slice(2);
    return { device, corner, load: () => loadTable(dir, kit, device, corner), meta: () => readTableHeader(tablePath(dir, kit, device, corner)).meta };
  });
  const access = kitAccessFromSources(kit, sources);
  return {
    ...access,
    dir,
    table: (device, corner) => loadTable(dir, kit, device, corner),
  };
}
