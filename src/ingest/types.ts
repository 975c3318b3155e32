import type { MismatchCoefficients, Polarity } from '../table/types.js';

/** Column quantities the importer understands (vbs is turned into vsb at read time). */
export const QUANTITIES = ['l', 'w', 'vgs', 'vds', 'vsb', 'vbs', 'id', 'gm', 'gds', 'gmb', 'cgg', 'cgs', 'cgd', 'cdd'] as const;
export type Quantity = (typeof QUANTITIES)[number];

export interface IngestOptions {
  kit: string;
  device: Polarity;
  /** Default 'tt'. */
  corner?: string;
  /** Width to keep when files hold several; the width of every row when there is no w column. Metres. */
  width?: number;
  /** Header text -> quantity, for columns the importer cannot name by itself. */
  map?: Record<string, string>;
  /** °C. */
  temperature?: number;
  note?: string;
  mismatch?: MismatchCoefficients;
  /** Called every ~64k rows with physical lines done and total. */
  onProgress?: (done: number, total: number) => void;
}

export type SweepOptions = Pick<IngestOptions, 'device' | 'map' | 'width' | 'onProgress'>;

/**
 * One file's rows, column-wise, in SI magnitudes. `vsb` is always present
 * (zeros when the file has none); `w` is present only when the file has a w column.
 */
export interface Samples {
  file: string;
  sha256: string;
  rows: number;
  columns: Partial<Record<Quantity, Float64Array>> & { l: Float64Array; vgs: Float64Array; vds: Float64Array; vsb: Float64Array; id: Float64Array };
  /** 1-based physical line of each row. */
  lines: Int32Array;
  /** Header cells as written. */
  headers: string[];
  /** Quantity -> header it was read from. */
  source: Partial<Record<Quantity, string>>;
  /** Keys of `map` that matched a header here. */
  mapped: string[];
}
