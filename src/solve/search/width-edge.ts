import type { SolveContext } from '../context.js';
import { candidateWidths } from '../evaluate/evaluate.js';
import type { Candidate } from './candidate.js';

// Bisection steps per device: the gm/ID range over 2^16 is below the candidate key's 1e-4 /V resolution on any
// range up to 6 /V, and within a few 1e-4 /V on the default range.
const EDGE_STEPS = 16;

/**
 * A refinement move with every output device wider than the width limit pulled back to the gm/ID at which it meets
 * the limit (at a fixed bias W = I/jd rises with gm/ID), device by device from the bottom (a lower device's VGS can
 * set the bias of the ones above). Near the width limit (or the highest gm/ID a length reaches) the best designs sit
 * on that edge, between the steps of the climb: a move past it would otherwise only be rejected. Returns the move
 * itself when it fits, or when it does not fit one gm/ID grid step lower either.
 */
export function atWidthEdge(ctx: SolveContext, c: Candidate): Candidate {
  const w0 = candidateWidths(ctx, c);
  if (w0 && !anyWider(w0, ctx.wmax)) return c;
  const d: Candidate = { topology: c.topology, l: c.l, gmid: [...c.gmid], setpoints: c.setpoints };
  // Not realisable counts as too wide (a gm/ID beyond what the length reaches at its bias: W = I/jd grows without
  // bound towards it), as in the exhaustive reference's width edge.
  const fits = (k: number, g: number): boolean => {
    d.gmid[k] = g;
    const w = candidateWidths(ctx, d);
    return w !== null && w[k] <= ctx.wmax;
  };
  for (let k = 0; k < c.gmid.length; k++) {
    const g = c.gmid[k];
    if (fits(k, g)) continue;
    // The edge is looked for within one grid step below (where the climb's moves land).
    let lo = Math.max(ctx.gmids[0], g - ctx.gmidStep);
    if (!fits(k, lo)) return c;
    let hi = g;
    for (let it = 0; it < EDGE_STEPS; it++) {
      const m = 0.5 * (lo + hi);
      if (fits(k, m)) lo = m;
      else hi = m;
    }
    d.gmid[k] = lo;
  }
  return d;
}

/** Some device of `w` is wider than `wmax`. */
export function anyWider(w: ArrayLike<number>, wmax: number): boolean {
  for (let k = 0; k < w.length; k++) if (w[k] > wmax) return true;
  return false;
}
