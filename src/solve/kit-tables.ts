import { StackwrightError } from '../errors.js';
import { sliceAt } from '../device/slice.js';
import type { LengthSlice } from '../device/types.js';
import type { DeviceTable, MismatchCoefficients, Polarity } from '../table/types.js';
import type { KitAccess } from './kit.js';

/**
 * Adapt a set of tables of one kit to what the search needs. Corners are the
 * ones present for either device; asking for a missing one names what exists.
 */
export function kitAccessFromTables(tables: DeviceTable[]): KitAccess {
  if (tables.length === 0) throw new StackwrightError('no tables given');
  const kit = tables[0].meta.kit;
  const byKey = new Map<string, DeviceTable>();
  for (const t of tables) {
    if (t.meta.kit !== kit) throw new StackwrightError(`tables of two kits given (${kit} and ${t.meta.kit})`);
    byKey.set(`${t.meta.device}/${t.meta.corner}`, t);
  }
  const corners = [...new Set(tables.map((t) => t.meta.corner))];
  const table = (corner: string, device: Polarity): DeviceTable => {
    const t = byKey.get(`${device}/${corner}`);
    if (!t) {
      const have = tables.filter((x) => x.meta.device === device).map((x) => x.meta.corner);
      throw new StackwrightError(
        `kit ${kit} has no ${device}-type table for corner ${corner}` + (have.length ? ` (has ${have.join(', ')})` : ` (no ${device}-type tables at all)`),
      );
    }
    return t;
  };
  return {
    kit,
    corners,
    lengths: (corner, device) => table(corner, device).axes.l,
    slice: (corner, device, l): LengthSlice => sliceAt(table(corner, device), l),
    temperature: (corner, device) => table(corner, device).meta.temperature,
    mismatch: (device) => {
      const nominal = tables.find((t) => t.meta.device === device && t.meta.mismatch);
      return nominal?.meta.mismatch as MismatchCoefficients | undefined;
    },
  };
}
