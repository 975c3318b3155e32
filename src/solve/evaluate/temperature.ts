import type { LengthSlice } from '../../device/types.js';
import type { DeviceTable, Polarity } from '../../table/types.js';
import { thermalVoltage } from '../../stack/index.js';
import type { KitAccess } from '../kit.js';

// A table slice carries its table; other slices (analytic test kits) have no temperature.
function sliceTemperature(s: LengthSlice): number | undefined {
  return (s as { table?: DeviceTable }).table?.meta?.temperature;
}

/** kT/q at the temperature of a corner's table: from the kit, else the table behind its slices, else 27 °C. */
export function cornerUt(kit: KitAccess, corner: string, device: Polarity): number {
  const t = kit.temperature?.(corner, device) ?? sliceTemperature(kit.slice(corner, device, kit.lengths(corner, device)[0]));
  return thermalVoltage(t ?? 27);
}
