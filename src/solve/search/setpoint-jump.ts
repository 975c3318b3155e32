import { topologyOf } from '../../topology/index.js';
import type { SolveContext } from '../context.js';
import { fullyOk, type Evaluated } from '../evaluate/evaluate.js';
import { SETPOINT_MIN, withSetpoint } from './candidate.js';
import { better } from './rank.js';
import { evaluateToPool, refine, type Seen } from './refine.js';

// Setpoint jumps from the answer, in climb steps (the topology's refineVoltageStep), each way: every step from 2 to 4,
// so no stretch meeting the targets a step wide or more lies between two jumps (random audit seed 20261421 #63: a
// reed180 triple's middle VDS met them from about 185 to 220 mV, 75 mV above the answer's, between jumps of 50 and 100).
const JUMPS = [2, 3, 4];

/** A design's least slack on the Rout and headroom targets (the margins of evaluate/checks.ts). */
function slack(e: Evaluated): number {
  return Math.min(e.margins.rout, e.margins.headroom);
}

/**
 * With objective area, from the climbs' answer `best`: each setpoint moved by each of JUMPS steps up and down, and a
 * climb from the jump meeting every target with the most slack on Rout and headroom, when it has more than `best`.
 * An area climb ends where Rout and headroom have no slack left, and the next step of a setpoint can lose some where a
 * few steps gain much more, so the climb spends it in another basin (random audit seed 20261383 #62: a reed180 triple's
 * middle VDS 100 mV up from the answer's, 0.2 more of Rout's ln-margin, and the climb from there 7 % smaller).
 * Returns the better design.
 */
export function fromSlackJump(ctx: SolveContext, best: Evaluated, seen: Seen, pool: Evaluated[]): Evaluated {
  if (ctx.meetOnly || ctx.spec.objective !== 'area' || !fullyOk(ctx, best)) return best;
  const c = best.cand;
  const step = topologyOf(c.topology).refineVoltageStep;
  let lead: Evaluated | undefined;
  for (let k = 0; k < c.setpoints.length; k++) {
    for (const j of JUMPS) {
      for (const sign of [-1, 1]) {
        const v = c.setpoints[k] + sign * j * step;
        if (v < SETPOINT_MIN) continue;
        const e = evaluateToPool(ctx, withSetpoint(c, k, v), seen, pool);
        if (e && fullyOk(ctx, e) && slack(e) > slack(lead ?? best)) lead = e;
      }
    }
  }
  if (!lead) return best;
  const climbed = refine(ctx, [lead], seen, pool) ?? lead;
  return better(ctx, climbed, best) ? climbed : best;
}
