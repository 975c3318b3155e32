import type { DesignSpec } from '../design/types.js';
import type { Polarity } from '../table/types.js';
import type { SizeResult } from '../solve/types.js';
import type { FrontPoint } from '../solve/pareto.js';
import type { DesignCurve } from '../device/curves.js';
import type { StageFrontPoint } from '../solve/stage-types.js';
import type { Confirmation } from '../confirm/types.js';
import type { StageConfirmation } from '../confirm/stage-types.js';


/** Design curves of one device of one kit and corner, one curve per length. */
export interface DesignCurves {
  kit: string;
  device: Polarity;
  corner: string;
  vds: number;
  vsb: number;
  curves: DesignCurve[];
}

export interface StackFront {
  /** StackResult.name it belongs to. */
  stack: string;
  points: FrontPoint[];
}

export interface HtmlReportInput {
  /** The parsed spec and the text it was parsed from. */
  spec: { parsed: DesignSpec; source: string };
  size: SizeResult;
  fronts?: StackFront[];
  /** Trade fronts of the gain stages, by stage name. */
  stageFronts?: Array<{ stage: string; points: StageFrontPoint[] }>;
  /** Design curves of each device used (at the nominal corner). */
  designCurves?: DesignCurves[];
  /** Program and version (and command) that made the report. */
  generatedBy: string;
  /** Passed in (not read from the clock) so reports are reproducible. */
  generatedAt?: string;
  /** Extra lines for the header, e.g. "kit demo180: invented demonstration data, not a real process". */
  notes?: string[];
  /** With `size --spice`: each chosen design confirmed in simulation. */
  confirmations?: Confirmation[];
  /** With `size --spice`: each chosen gain stage confirmed in simulation. */
  stageConfirmations?: StageConfirmation[];
}
