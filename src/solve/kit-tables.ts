import { StackwrightError } from '../errors.js';
import { sliceAt } from '../device/slice.js';
import type { LengthSlice } from '../device/types.js';
import type { DeviceTable, MismatchCoefficients, Polarity, TableMeta } from '../table/types.js';
import type { KitAccess } from './kit.js';

/** One table of a kit by name, read only when first asked for. */
export interface TableSource {
  device: Polarity;
  corner: string;
  /** The whole table (may throw: a broken file is an error only when it is needed). */
  load(): DeviceTable;
  /** Its metadata alone, cheaper than `load` when only the header is needed. */
  meta(): TableMeta;
}

/**
 * Adapt a set of tables of one kit to what the search needs. Corners are the
 * ones present for either device; asking for a missing one names what exists.
 */
export function kitAccessFromTables(tables: DeviceTable[]): KitAccess {
  if (tables.length === 0) throw new StackwrightError('no tables given');
  const kit = tables[0].meta.kit;
  for (const t of tables) {
    if (t.meta.kit !== kit) throw new StackwrightError(`tables of two kits given (${kit} and ${t.meta.kit})`);
  }
  return kitAccessFromSources(
    kit,
    tables.map((t) => ({ device: t.meta.device, corner: t.meta.corner, load: () => t, meta: () => t.meta })),
  );
}

/**
 * The same adapter over tables read on demand: sizing at one corner reads that
 * corner's tables only, so an unrelated broken or slow table costs nothing.
 */
export function kitAccessFromSources(kit: string, sources: TableSource[]): KitAccess {
  const byKey = new Map<string, TableSource>();
  for (const s of sources) byKey.set(`${s.device}/${s.corner}`, s);
  const corners = [...new Set(sources.map((s) => s.corner))];
  const loaded = new Map<string, DeviceTable>();
  const table = (corner: string, device: Polarity): DeviceTable => {
    const key = `${device}/${corner}`;
    const hit = loaded.get(key);
    if (hit) return hit;
    const s = byKey.get(key);
    if (!s) {
      const have = sources.filter((x) => x.device === device).map((x) => x.corner);
      throw new StackwrightError(
        `kit ${kit} has no ${device}-type table for corner ${corner}` + (have.length ? ` (has ${have.join(', ')})` : ` (no ${device}-type tables at all)`),
      );
    }
    const t = s.load();
    loaded.set(key, t);
    return t;
  };
  return {
    kit,
    corners,
    lengths: (corner, device) => table(corner, device).axes.l,
    slice: (corner, device, l): LengthSlice => sliceAt(table(corner, device), l),
    temperature: (corner, device) => table(corner, device).meta.temperature,
    mismatch: (device) => {
      // The first table of this device (in the order given) that carries coefficients;
      // headers only, and a table whose header cannot be read is passed over here.
      for (const s of sources) {
        if (s.device !== device) continue;
        let meta: TableMeta;
        try {
          meta = s.meta();
        } catch {
          continue;
        }
        if (meta.mismatch) return meta.mismatch as MismatchCoefficients;
      }
      return undefined;
    },
  };
}
