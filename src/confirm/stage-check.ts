import type { StageSpec } from '../design/types.js';
import type { StageSimulatedFigures } from './stage-types.js';
import type { Miss } from './types.js';

/** Targets one corner's simulation of a stage misses: the gain at the design point, else the swing with gain ≥ target. */
export function stageMisses(spec: Pick<StageSpec, 'gain' | 'swing' | 'output'>, f: StageSimulatedFigures): Miss[] {
  if (!(f.gain >= spec.gain)) return [{ target: 'gain', required: spec.gain, achieved: f.gain, at: spec.output, device: null, corner: f.corner }];
  if (!(f.swing >= spec.swing)) return [{ target: 'swing', required: spec.swing, achieved: f.swing, at: null, device: null, corner: f.corner }];
  return [];
}
