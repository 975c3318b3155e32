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
}
