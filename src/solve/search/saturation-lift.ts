import { topologyOf } from '../../topology/index.js';
import type { SolveContext } from '../context.js';
import type { Evaluated } from '../evaluate/evaluate.js';
import { leastSaturated } from '../evaluate/checks.js';
import { distanceToFeasible } from '../../policy.js';
import { withSetpoint } from './candidate.js';
import { evaluateOnce, type Seen } from './refine.js';

// A lower device within this saturation margin (VDS − VDSsat over 50 mV: 1 mV) is at its edge.
const SATURATION_EDGE = 0.02;
// Its setpoint's lifts, in climb steps (the topology's refineVoltageStep), tried in turn.
const LIFTS = [1, 2];

/**
 * A start biased another way (the topology's otherBias) that misses the targets by more than `reach` with a lower
 * device at its saturation edge: that device's setpoint lifted by each of LIFTS climb steps in turn, and the first lift
 * within `reach` (null when none is, or the start is not at an edge). The screen's setpoints put the bottom just
 * saturated, for the least headroom by its estimate (setpoints + VDSsat of the top); squeezed, the device under the top
 * gives up its VDS as the output falls, the bottom's drain falls with it, and a bottom with no slack leaves saturation
 * at once, so the headroom misses by hundreds of mV where a bottom a step higher meets it (random audit seed 20261405
 * #31: a demo180 p triple's squeezed start at a 125 mV bottom setpoint missed the headroom by 284 mV, at 150 mV it met
 * it; the climb from there ends 15 % smaller than the climbs from the screen's own designs).
 */
export function liftedOffSaturationEdge(ctx: SolveContext, start: Evaluated, seen: Seen, reach: number): Evaluated | null {
  if (!(start.margins.saturation < SATURATION_EDGE) || distanceToFeasible(start.margins) <= reach) return null;
  const k = leastSaturated(start.nominal);
  if (k < 0 || k >= start.cand.setpoints.length) return null;
  const c = start.cand;
  const step = topologyOf(c.topology).refineVoltageStep;
  for (const n of LIFTS) {
    const e = evaluateOnce(ctx, withSetpoint(c, k, c.setpoints[k] + n * step), seen);
    if (e && distanceToFeasible(e.margins) <= reach) return e;
  }
  return null;
}
