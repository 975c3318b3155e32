import type { SolveContext } from '../context.js';
import { fullyOk, type Evaluated } from '../evaluate/evaluate.js';
import { better } from './rank.js';
import { evaluateToPool, refine, type Seen } from './refine.js';
import { widestAt } from './width-edge.js';

/**
 * With objective Rout: the climbs' answer with every device raised to its widest (the width limit, or the top of the
 * gm/ID range: widestAt), and a climb from there when that beats the answer. Rout rises with gm/ID into weak inversion,
 * but not along every path: a climb from the screen's designs can follow the steepest rise to a low bump between
 * (random audit seed 20261371 #145: a reed180 stacked cascode climbed from 10.1 and 19 /V to 144.5 kΩ at 12.8 and
 * 11 /V; with both devices at the range's top, 19 /V, 159.6 kΩ). One probe per search, a climb only when it wins.
 */
export function fromWidest(ctx: SolveContext, best: Evaluated, seen: Seen, pool: Evaluated[]): Evaluated {
  if (ctx.meetOnly || ctx.spec.objective !== 'rout' || !fullyOk(ctx, best)) return best;
  const c = widestAt(ctx, best.cand);
  const e = c && evaluateToPool(ctx, c, seen, pool);
  if (!e || !better(ctx, e, best)) return best;
  return refine(ctx, [e], seen, pool) ?? e;
}
