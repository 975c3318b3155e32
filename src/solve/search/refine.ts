import { topologyOf } from '../../topology/index.js';
import type { Candidate } from './candidate.js';
import { candidateKey } from './candidate.js';
import type { SolveContext } from '../context.js';
import { evaluateCandidate, type Evaluated } from '../evaluate/evaluate.js';
import { better } from './rank.js';

/** Exactly evaluated candidates by key (null: not realisable), shared by screen and refinement. */
export type Seen = Map<string, Evaluated | null>;

export function evaluateOnce(ctx: SolveContext, c: Candidate, seen: Seen): Evaluated | null {
  const k = candidateKey(c);
  if (!seen.has(k)) seen.set(k, evaluateCandidate(ctx, c));
  return seen.get(k)!;
}

function nearestIndex(values: readonly number[], x: number): number {
  let best = 0;
  for (let j = 1; j < values.length; j++) if (Math.abs(values[j] - x) < Math.abs(values[best] - x)) best = j;
  return best;
}

/** One-coordinate moves: L to the neighbouring grid lengths, gm/ID and setpoints by ± step. */
export function neighbours(ctx: SolveContext, c: Candidate, gstep: number, vstep: number): Candidate[] {
  const out: Candidate[] = [];
  const gLo = ctx.gmids[0];
  const gHi = ctx.gmids[ctx.gmids.length - 1];
  const with_ = (f: (d: Candidate) => void): void => {
    const d: Candidate = { topology: c.topology, l: [...c.l], gmid: [...c.gmid], setpoints: [...c.setpoints] };
    f(d);
    out.push(d);
  };
  for (let k = 0; k < c.l.length; k++) {
    const j = nearestIndex(ctx.lengths, c.l[k]);
    for (const dj of [-1, 1]) {
      const l = ctx.lengths[j + dj];
      if (l !== undefined) with_((d) => (d.l[k] = l));
    }
    for (const s of [-1, 1]) {
      const g = c.gmid[k] + s * gstep;
      if (g >= gLo - 1e-9 && g <= gHi + 1e-9) with_((d) => (d.gmid[k] = g));
    }
  }
  for (let k = 0; k < c.setpoints.length; k++) {
    for (const s of [-1, 1]) {
      const v = c.setpoints[k] + s * vstep;
      if (v >= 0.02) with_((d) => (d.setpoints[k] = v));
    }
  }
  return out;
}

/**
 * Local refinement: hill-climb from the seeds over neighbouring grid values,
 * halving the gm/ID and setpoint steps when no move improves. Every design it
 * returns was evaluated exactly.
 */
export function refine(ctx: SolveContext, seeds: readonly Evaluated[], seen: Seen, pool: Evaluated[]): Evaluated | undefined {
  let best = seeds[0];
  if (!best) return undefined;
  let gstep = ctx.gmidStep / 2;
  let vstep = topologyOf(best.cand.topology).refineVoltageStep;
  let from = [...seeds];
  for (let round = 0; round < 12; round++) {
    let improved = false;
    for (const s of from) {
      for (const n of neighbours(ctx, s.cand, gstep, vstep)) {
        const key = candidateKey(n);
        if (seen.has(key)) continue;
        const e = evaluateOnce(ctx, n, seen);
        if (!e) continue;
        pool.push(e);
        if (better(ctx, e, best)) {
          best = e;
          improved = true;
        }
      }
    }
    from = [best];
    if (!improved) {
      gstep /= 2;
      vstep /= 2;
      if (gstep < ctx.gmidStep / 8 && vstep < 0.003) break;
    }
  }
  return best;
}
