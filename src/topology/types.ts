import type { StackShape } from '../stack/types.js';
import type { VdsMode } from '../stack/invert.js';

/** Name of a registered topology descriptor (e.g. 'cascode'). */
export type Topology = string;

/** One point in the design space: L and gm/ID per device, plus the VDS setpoints. */
export interface Candidate {
  topology: Topology;
  l: number[];
  gmid: number[];
  setpoints: number[];
}

/** One device choice in the screen, with its saturation small-signal estimates (SI). */
export interface StageOption {
  l: number;
  gmid: number;
  w: number;
  area: number;
  /** VGS at the design bias, V. */
  vgs: number;
  ro: number;
  /** gm + gmb, S. */
  gmt: number;
  /** Saturation VDS estimate 2/(gm/ID), floored at 100 mV (≈ 4·UT, common practice), for the top device's headroom. */
  vdsat: number;
  /** EKV saturation voltage from gm/ID and the table's slope factor (as the exact check uses), V. */
  sat: number;
  sigma: number;
}

/** Where a device sits: its VDS (or diode), VSB, and what the screen asks of it. */
export interface StageBias {
  mode: VdsMode;
  vsb: number;
  /** Take small-signal values at this VDS (same VGS) instead of at the design bias. */
  smallAt?: number;
  gmids?: readonly number[];
  /** A device below the top one: it must be saturated at its design bias. */
  lower?: boolean;
}

/**
 * Criteria (all minimised) by which per-stage options are pruned before
 * combining; optionally also as `size` values written by `into` (no array per option).
 */
export type Criteria = ((o: StageOption) => number[]) & {
  readonly size?: number;
  readonly into?: (o: StageOption, out: Float64Array, at: number) => void;
};

/**
 * What the search lends a topology to enumerate its screen: per-stage options
 * over the L × gm/ID grid, pruning, and the pools that keep the promising
 * combinations. Rout estimates use Rout ≈ ro_N + (1 + gmt_N·ro_N)·R_below.
 */
export interface ScreenTools {
  /** Headroom target, V. */
  readonly headroom: number;
  /** Rout target, Ω. */
  readonly rout: number;
  /** Mismatch budget (1-sigma, fraction), when the spec has one. */
  readonly mismatch?: number;
  /** Mid-span stack voltage, V. */
  readonly vmid: number;
  /** gm/ID grid, 1/V. */
  readonly gmids: readonly number[];
  /** Thermal voltage at the nominal corner, V. */
  readonly ut: number;
  /** Options for one device (shared with later calls asking the same: read only). */
  options(bias: StageBias): readonly StageOption[];
  /** Options no other one beats on every criterion (shared like the options: read only). */
  prune(options: readonly StageOption[], crit: Criteria): readonly StageOption[];
  /** Pruned top-device options above `below` volts, small-signal values taken at the target headroom. */
  top(below: number, gmids?: readonly number[]): readonly StageOption[];
  /** VDS that the top device sees at the headroom target with `below` volts under it, V. */
  topVds(below: number): number;
  /** VDS setpoint grid for the lower devices, V. */
  setpointGrid(step: number): number[];
  readonly crit: { bottom: Criteria; diode: Criteria; mid: Criteria; top: Criteria };
  /** Rate one combination; true when some pool would keep it (then call keep). */
  wants(area: number, rout: number, headroom: number, sigma: number): boolean;
  /** Could any of `count` combinations bounded by these values enter a pool? false: skip them all. */
  mayWant(count: number, area: number, rout: number, headroom: number, sigma: number): boolean;
  /** Store the combination last rated by `wants`. */
  keep(l: number[], gmid: number[], setpoints: number[]): void;
  /** Count `count` combinations as screened without rating them (a search found they cannot beat the ones rated). */
  covered(count: number): void;
}

/**
 * Everything that makes one topology: its stack shape (roles, setpoints,
 * biasing, rule-of-thumb headroom) and how the search enumerates and refines
 * it. A new topology is one file exporting a descriptor plus one
 * registerTopology line in index.ts.
 */
export interface TopologyDescriptor extends StackShape {
  /** First VDS-setpoint step of the local refinement, V. */
  refineVoltageStep: number;
  /** Enumerate the screen's combinations. */
  screen(t: ScreenTools): void;
  /**
   * The same devices biased another way that the screen's estimates cannot rate (more starts for the climb), or none
   * (noOtherBias). Every descriptor has it, so all descriptors share one object shape and code reading them stays
   * monomorphic. `vmid`: mid-span stack voltage, V; `gmidLow`: the lowest gm/ID allowed, 1/V.
   */
  otherBias(c: Candidate, vmid: number, gmidLow: number): Candidate[];
}

/** otherBias of a topology with no other bias. */
export function noOtherBias(): Candidate[] {
  return [];
}

/** VDS a squeezed top keeps at mid-span (squeezedSetpoint), V. */
const TOP_ROOM = 0.15;

/**
 * For otherBias: the setpoint of the device under the top when it takes all of mid-span `vmid` but TOP_ROOM and the
 * setpoints `below` it, on a grid of `step` (rounded to 1 µV); null unless that is more than a step above `current`.
 * As the output falls to the headroom target the top is squeezed out of saturation and the device under it gives up
 * its spare VDS, so the headroom can sit far below what the screen's estimate (setpoints + VDSsat of the top) says.
 */
export function squeezedSetpoint(vmid: number, below: number, current: number, step: number): number | null {
  const s = Math.floor((vmid - TOP_ROOM - below) / step + 1e-9) * step;
  return s > current + step ? Math.round(s * 1e6) / 1e6 : null;
}
