import { topologyOf } from '../../topology/index.js';
import type { SolveContext } from '../context.js';
import { fullyOk, type Evaluated } from '../evaluate/evaluate.js';
import { SETPOINT_MIN } from './candidate.js';
import { better } from './rank.js';
import { evaluateToPool, refine, type Seen } from './refine.js';

/**
 * Where the climbs' answer lies on one side of the screen's best design `seed` along its setpoints: a climb from the
 * seed with each of those setpoints a climb step (the topology's refineVoltageStep) to the other side. Along a setpoint
 * the targets can be met in separate valleys with a ridge between them (random audit seed 20261371 #132: a demo180
 * cascode's least area at 110 mV and at 140 mV, at every length choice, about twice as large at 125 mV between), the
 * screen's grid point on the ridge, and the first move of the seed's climb picks the valley every later move keeps
 * to. Returns the better design.
 */
export function fromOtherSide(ctx: SolveContext, seed: Evaluated, best: Evaluated, seen: Seen, pool: Evaluated[]): Evaluated {
  if (ctx.meetOnly || !fullyOk(ctx, best)) return best;
  const from = seed.cand.setpoints;
  const step = topologyOf(seed.cand.topology).refineVoltageStep;
  const setpoints = from.map((s, k) => Math.round((s - Math.sign(best.cand.setpoints[k] - s) * step) * 1e6) / 1e6);
  if (setpoints.every((s, k) => s === from[k]) || setpoints.some((s) => s < SETPOINT_MIN)) return best;
  const e = evaluateToPool(ctx, { ...seed.cand, setpoints }, seen, pool);
  if (!e) return best;
  const climbed = refine(ctx, [e], seen, pool) ?? e;
  return better(ctx, climbed, best) ? climbed : best;
}
