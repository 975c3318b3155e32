import type { StageSpec } from '../design/types.js';
import type { StageSimulatedFigures } from './stage-types.js';
import type { Miss } from './types.js';

/**
 * Targets one corner's simulation of a stage misses: the gain at the design
 * point, else the swing with gain ≥ target; and, with a gbw target, the
 * simulated unity-gain frequency (null, never reaching 1 in the band, cannot
 * confirm it).
 */
export function stageMisses(spec: Pick<StageSpec, 'gain' | 'swing' | 'output' | 'gbw'>, f: StageSimulatedFigures): Miss[] {
  const out: Miss[] = [];
  if (!(f.gain >= spec.gain)) out.push({ target: 'gain', required: spec.gain, achieved: f.gain, at: spec.output, device: null, corner: f.corner });
  else if (!(f.swing >= spec.swing)) out.push({ target: 'swing', required: spec.swing, achieved: f.swing, at: null, device: null, corner: f.corner });
  if (spec.gbw !== undefined && !(f.gbw !== null && f.gbw >= spec.gbw)) {
    out.push({ target: 'gbw', required: spec.gbw, achieved: f.gbw, at: spec.output, device: null, corner: f.corner });
  }
  return out;
}
