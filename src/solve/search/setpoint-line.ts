import { topologyOf } from '../../topology/index.js';
import type { SolveContext } from '../context.js';
import { fullyOk, type Evaluated } from '../evaluate/evaluate.js';
import { SETPOINT_MIN, withSetpoint, type Candidate } from './candidate.js';
import { better } from './rank.js';
import { evaluateOnce, lookOnce, refine, type Seen } from './refine.js';
import { routSurelyBelow, surelyMisses } from './quick.js';
import { widestAt } from './width-edge.js';
import { setpointRoom } from './line-probes.js';

// Width margin (ln of limit / widest device) under which the width limit counts as binding: within 1 %.
const ON_LIMIT = 0.01;

/**
 * With objective Rout, where the climbs' answer sits on the width limit: each setpoint over its whole range, a climb
 * step (the topology's refineVoltageStep) apart, with every device raised to the width limit (widestAt), and a climb
 * from the best probe that beats the answer. Along such a line Rout has several separate peaks (stretches meeting the
 * targets, between stretches where they need wider devices), some only a couple of steps wide, and a climb stays on
 * the first it reaches. Each probe is evaluated only when its quick look leaves it a chance. Returns the better design.
 */
export function fromSetpointLine(ctx: SolveContext, best: Evaluated, seen: Seen, pool: Evaluated[]): Evaluated {
  if (ctx.meetOnly || ctx.spec.objective !== 'rout' || !(best.margins.width < ON_LIMIT) || !fullyOk(ctx, best)) return best;
  let lead: Evaluated | undefined;
  for (const c of setpointLine(ctx, best.cand)) {
    const k = seen.key(c);
    let e = seen.get(k);
    if (e === undefined) {
      const l = lookOnce(ctx, seen, k, c);
      if (!l || surelyMisses(ctx, l) || routSurelyBelow(l, best.nominal.rout)) continue;
      e = evaluateOnce(ctx, c, seen, l.start);
      if (e) pool.push(e);
    }
    if (e && better(ctx, e, lead ?? best)) lead = e;
  }
  if (!lead) return best;
  const climbed = refine(ctx, [lead], seen, pool) ?? lead;
  return better(ctx, climbed, best) ? climbed : best;
}

/** The probes of fromSetpointLine: each setpoint of `c` on its line (its own value excepted), every device at its widest. */
function setpointLine(ctx: SolveContext, c: Candidate): Candidate[] {
  const out: Candidate[] = [];
  const step = topologyOf(c.topology).refineVoltageStep;
  for (let k = 0; k < c.setpoints.length; k++) {
    const own = c.setpoints[k];
    const room = setpointRoom(ctx, c.setpoints, k);
    for (let j = Math.ceil((SETPOINT_MIN - own) / step); own + j * step <= room + 1e-9; j++) {
      if (j === 0) continue;
      const d = widestAt(ctx, withSetpoint(c, k, own + j * step));
      if (d) out.push(d);
    }
  }
  return out;
}
