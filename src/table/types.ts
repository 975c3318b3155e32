import { blockSize, rowMajorStrides } from '../numeric/strides.js';

/**
 * The in-memory form of one characterisation table: one kit, one device
 * polarity, one corner. Values are magnitudes (PMOS signs removed) in SI units,
 * for a device of width `meta.referenceWidth`.
 */
export type Polarity = 'n' | 'p';

/** Grid axes, in storage order (row-major: l slowest, vsb fastest). */
export const AXES = ['l', 'vgs', 'vds', 'vsb'] as const;
export type Axis = (typeof AXES)[number];

/** Quantities a table may store, all at the reference width. `id` is required. */
export const STORED = ['id', 'gm', 'gds', 'gmb', 'cgg', 'cgs', 'cgd', 'cdd'] as const;
export type StoredQuantity = (typeof STORED)[number];

export const UNITS: Record<Axis | StoredQuantity, string> = {
  l: 'm', vgs: 'V', vds: 'V', vsb: 'V',
  id: 'A', gm: 'S', gds: 'S', gmb: 'S',
  cgg: 'F', cgs: 'F', cgd: 'F', cdd: 'F',
};

export interface SourceFile {
  /** Path as given on the command line (relative paths kept relative). */
  file: string;
  sha256: string;
  rows: number;
}

/** Pelgrom coefficients, SI: avt in V·m, abeta as a fraction·m (1 %·µm = 1e-8). */
export interface MismatchCoefficients {
  avt: number;
  abeta: number;
}

export interface TableMeta {
  format: 'stackwright-table';
  version: 1;
  kit: string;
  device: Polarity;
  corner: string;
  /** Temperature in °C when known. */
  temperature?: number;
  /** Width the stored values refer to, metres. */
  referenceWidth: number;
  sources: SourceFile[];
  /** Quantity -> how it was derived, for quantities not read from a column. */
  derived: Partial<Record<StoredQuantity, string>>;
  units: Record<string, string>;
  /** Free text, e.g. "invented demonstration data, not a real process". */
  note?: string;
  mismatch?: MismatchCoefficients;
}

export interface DeviceTable {
  meta: TableMeta;
  /** Strictly increasing axis values. */
  axes: Record<Axis, Float64Array>;
  /** Each array has length nl*nvgs*nvds*nvsb, index ((il*nvgs+ig)*nvds+id)*nvsb+is. */
  data: Partial<Record<StoredQuantity, Float64Array>> & { id: Float64Array };
}

/** Points along each axis, in storage order (l, vgs, vds, vsb). */
export function gridDims(axes: Record<Axis, Float64Array>): number[] {
  return AXES.map((a) => axes[a].length);
}

export function tableSize(axes: Record<Axis, Float64Array>): number {
  return blockSize(gridDims(axes));
}

export function flatIndex(axes: Record<Axis, Float64Array>, il: number, ig: number, id: number, is: number): number {
  const st = rowMajorStrides(gridDims(axes));
  return il * st[0] + ig * st[1] + id * st[2] + is * st[3];
}
