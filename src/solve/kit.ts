import type { LengthSlice } from '../device/types.js';
import type { MismatchCoefficients, Polarity } from '../table/types.js';

/** What the search needs from a kit's tables; the table layer is adapted to this. */
export interface KitAccess {
  kit: string;
  corners: string[];
  /** Channel lengths the table has for this corner/device, ascending, metres. */
  lengths(corner: string, device: Polarity): Float64Array;
  /** A length slice (may be between table lengths). Throws kind 'range' outside. */
  slice(corner: string, device: Polarity, l: number): LengthSlice;
  mismatch(device: Polarity): MismatchCoefficients | undefined;
  /** Temperature of a corner's table, °C, when known (optional: else read from the slice's table, else 27 °C). */
  temperature?(corner: string, device: Polarity): number | undefined;
}
