import type { LengthSlice } from '../device/types.js';

/** One device of a stack: a length slice and the width it is drawn at. */
export interface StackDevice {
  readonly slice: LengthSlice;
  readonly w: number;
}

/** One device's bias and small-signal values at its actual width (magnitudes, SI). */
export interface DeviceBias {
  vgs: number;
  vds: number;
  vsb: number;
  id: number;
  gm: number;
  gds: number;
  gmb: number;
}

/**
 * DC operating point of a stack in stack coordinates: `nodes[0]` is the rail
 * (0 V), `nodes[k]` the drain of device k (1-based), `nodes[N]` = v.
 */
export interface StackOp {
  v: number;
  i: number;
  nodes: number[];
  devices: DeviceBias[];
}

/** A starting point for the DC solve (continuation along a curve). */
export interface OpGuess {
  i: number;
  nodes: readonly number[];
}
