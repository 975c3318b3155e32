import type { LengthSlice, OperatingPoint } from '../device/types.js';

/** One device of a stack: a length slice and the width it is drawn at. */
export interface StackDevice {
  readonly slice: LengthSlice;
  readonly w: number;
}

/** One device's bias and small-signal values at its actual width (magnitudes, SI): the operating-point record, in part. */
export type DeviceBias = Pick<OperatingPoint, 'vgs' | 'vds' | 'vsb' | 'id' | 'gm' | 'gds' | 'gmb'>;

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

/** Position of an output device, from the rail outwards. */
export type Role = 'bottom' | 'middle' | 'top';

/**
 * What the stack layer needs to know about a topology (the rest of its
 * descriptor, in src/topology, tells the search how to enumerate it).
 */
export interface StackShape {
  name: string;
  /** Output devices from the rail outwards. */
  roles: readonly Role[];
  /** VDS setpoints the search chooses for the lower devices (low-voltage biasing). */
  setpoints: number;
  /** The bottom device's VDS equals its VGS (its bias diode sets the node above it). */
  bottomDiode: boolean;
  /** Bias diode k > 0 sits on diode k − 1 (VSB = that diode's gate). */
  stackedBias: boolean;
  /** Hand-analysis headroom rule of thumb from each device's Vov and VGS, V (common practice). */
  ruleOfThumbHeadroom(vov: readonly number[], vgs: readonly number[]): number;
}

/** What square-law hand analysis predicts for a sized stack. */
export interface SquareLawCheck {
  vth: number;
  /** Square-law VGS of each device at its current and size. */
  vgs: number[];
  vov: number[];
  /** Rule-of-thumb headroom: Vov (single), 2Vov (cascode), VGS+Vov (cascode-stacked), 3Vov (triple). */
  headroom: number;
  /** Rout from λ = gds/ID at each device: ro = 1/(λ·I). */
  rout: number;
  lambda: number[];
}
