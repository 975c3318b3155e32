import { topologyOf } from '../../topology/index.js';
import type { SolveContext } from '../context.js';
import { fullyOk, type Evaluated } from '../evaluate/evaluate.js';
import { SETPOINT_MIN, withSetpoint, type Candidate } from './candidate.js';
import { better } from './rank.js';
import { evaluateOnce, lookOnce, refine, type Hopeless, type Seen } from './refine.js';
import { routSurelyBelow, surelyMisses } from './quick.js';
import { widestAt } from './width-edge.js';
import { setpointRoom } from './line-probes.js';

// Width margin (ln of limit / widest device) under which the width limit counts as binding: within 1 %.
const ON_LIMIT = 0.01;

/**
 * With objective Rout, where the climbs' answer sits on the width limit or has a device at the top of the gm/ID range
 * (atWidest): each setpoint over its whole range, a climb step (the topology's refineVoltageStep) apart, with every
 * device raised to the width limit or the range's top (widestAt), and a climb from the best probe that beats the answer.
 * Along such a line Rout has several separate peaks (stretches meeting the targets, between stretches where they need
 * wider devices), some only a couple of steps wide, and a climb stays on the first it reaches. Where the width limit is
 * far off too: Rout at the headroom target peaked 20 mV wide just above where that target is first met (random audit
 * seed 20261425 #137, a demo180 cascode, 4.8e6 Ω against 4.4e6 Ω either side), the climbs from below stalled in a
 * headroom dip short of it, those from above on a lower peak. Each probe is evaluated only when its quick look leaves
 * it a chance. Returns the better design.
 */
export function fromSetpointLine(ctx: SolveContext, best: Evaluated, seen: Seen, pool: Evaluated[]): Evaluated {
  if (ctx.meetOnly || ctx.spec.objective !== 'rout' || !atWidest(ctx, best) || !fullyOk(ctx, best)) return best;
  return alongSetpointLine(
    ctx, best, seen, pool,
    (a, b) => better(ctx, a, b),
    (l, from) => surelyMisses(ctx, l) || routSurelyBelow(l, from.nominal.rout),
    (lead) => refine(ctx, [lead], seen, pool),
  );
}

/** Some device of `e` at its widest: on the width limit, or at the top of the gm/ID range. */
function atWidest(ctx: SolveContext, e: Evaluated): boolean {
  const gHi = ctx.gmids[ctx.gmids.length - 1];
  return e.margins.width < ON_LIMIT || e.cand.gmid.some((g) => g >= gHi - 1e-9);
}

/**
 * The nearest Rout at the headroom target's version of fromSetpointLine, by the nearest points' own order (`prefer`,
 * `hopeless`, climbs of `rounds`): where the climbs' answer `from` sits on the width limit, each setpoint's line with
 * every device at its widest, and a climb from the best probe that beats `from`. Rout at the headroom target has
 * separate peaks along a setpoint too (random audit seed 20261383 #100: a reed180 p cascode's at its bottom's
 * saturation edge at 255 mV and one 75 mV higher, 12 % above it). Returns the better design.
 */
export function nearestAlongSetpoints(
  ctx: SolveContext, from: Evaluated, seen: Seen, pool: Evaluated[], prefer: (a: Evaluated, b: Evaluated) => boolean, hopeless: Hopeless, rounds: number,
): Evaluated {
  if (!(from.margins.width < ON_LIMIT)) return from;
  return alongSetpointLine(ctx, from, seen, pool, prefer, hopeless, (lead) => refine(ctx, [lead], seen, pool, prefer, hopeless, rounds));
}

/**
 * The probes of setpointLine from `from` that `hopeless` leaves a chance, evaluated once; `climb` from the one `prefer`
 * ranks first, and the climb's answer when `prefer` ranks it above `from` (else `from`).
 */
function alongSetpointLine(
  ctx: SolveContext, from: Evaluated, seen: Seen, pool: Evaluated[], prefer: (a: Evaluated, b: Evaluated) => boolean, hopeless: Hopeless,
  climb: (lead: Evaluated) => Evaluated | undefined,
): Evaluated {
  let lead: Evaluated | undefined;
  for (const c of setpointLine(ctx, from.cand)) {
    const k = seen.key(c);
    let e = seen.get(k);
    if (e === undefined) {
      const l = lookOnce(ctx, seen, k, c);
      if (!l || hopeless(l, from)) continue;
      e = evaluateOnce(ctx, c, seen, l.start);
      if (e) pool.push(e);
    }
    if (e && prefer(e, lead ?? from)) lead = e;
  }
  if (!lead) return from;
  const climbed = climb(lead) ?? lead;
  return prefer(climbed, from) ? climbed : from;
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
