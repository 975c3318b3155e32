import type { Polarity } from '../table/types.js';

import type { Topology } from '../topology/types.js';

export type { Topology };
export type { Objective } from '../policy.js';
import type { Objective } from '../policy.js';

/** One current source/sink to size, after validation; all SI. */
export interface StackSpec {
  name: string;
  device: Polarity;
  /** 'auto' tries every topology and reports each. */
  topology: Topology | 'auto';
  /** Target output current, A. */
  current: number;
  /** Minimum output resistance, Ω. */
  rout: number;
  /** Stack voltage at which Rout >= rout must already hold, V. */
  headroom: number;
  /** Highest stack voltage over which the targets must hold, V (default: supply). */
  span: number;
  /** Allowed channel lengths, m; step optional (default: the table's lengths). */
  l?: { min: number; max: number; step?: number };
  /** Allowed gm/ID range, 1/V (default: whatever the table reaches). */
  gmid?: { min: number; max: number };
  objective: Objective;
  /** Required 1-sigma output-current mismatch, as a fraction (0.5% -> 0.005). */
  mismatch?: number;
  /** Current in each bias (diode) branch, A (default: `current`). */
  biasCurrent?: number;
  /** Widest allowed output device, m (default: the kit's, see solve/width.ts). */
  wmax?: number;
}

export interface DesignSpec {
  /** Path of the spec file, for messages. */
  file: string;
  kit: string;
  /** Corners that must all meet the targets; the first is the nominal one. */
  corners: string[];
  supply: number;
  stacks: StackSpec[];
  /** Gain stages (absent or empty when the spec has none). */
  stages?: StageSpec[];
}

/** Input-side topologies of a gain stage: common source, or input device plus one cascode. */
export type InputTopology = 'single' | 'cascode';
export const INPUT_TOPOLOGIES: readonly InputTopology[] = ['single', 'cascode'];
export type StageObjective = 'area' | 'swing' | 'gain';

/** Search limits of one side of a stage. */
export interface StageSideSpec {
  /** Allowed channel lengths, m. */
  l?: { min: number; max: number; step?: number };
  /** Allowed gm/ID range, 1/V. */
  gmid?: { min: number; max: number };
  /** Current in each bias (diode) branch, A (default: the stage current). */
  biasCurrent?: number;
}

/** One gain stage to size (input side and load side sharing the output node), after validation; all SI. */
export interface StageSpec {
  name: string;
  /** Current through both sides at the design point, A. */
  current: number;
  /** Minimum |dVout/dVin| over the swing. */
  gain: number;
  /** Minimum output range with gain ≥ target, V. */
  swing: number;
  /** Design-point output voltage, V (default supply/2). */
  output: number;
  input: StageSideSpec & { device: Polarity; topology: InputTopology };
  /** Load side: a current-source stack of the other type. */
  load: StageSideSpec & { topology: Topology | 'auto' };
  /** Minimum gain-bandwidth product, Hz (needs `cap`). */
  gbw?: number;
  /** Load capacitance at the output, F. */
  cap?: number;
  objective: StageObjective;
}
