import type { SolveContext } from '../context.js';
import { candidateWidths } from '../evaluate/evaluate.js';
import type { Candidate } from './candidate.js';
import { CandidateIds } from './candidate-map.js';
import { edgeOf } from '../../numeric/index.js';

/**
 * Bisection steps of a gm/ID edge (the width limit, the minimum width): the gm/ID range over 2^16 is below the
 * candidate key's 1e-4 /V resolution on any range up to 6 /V, and within a few 1e-4 /V on the default range.
 */
export const EDGE_STEPS = 16;

/**
 * A refinement move with every output device wider than the width limit pulled back to the gm/ID at which it meets
 * the limit (at a fixed bias W = I/jd rises with gm/ID), device by device from the bottom (a lower device's VGS can
 * set the bias of the ones above). Near the width limit (or the highest gm/ID a length reaches) the best designs sit
 * on that edge, between the steps of the climb: a move past it would otherwise only be rejected. Returns the move
 * itself when it fits, or when it does not fit one gm/ID grid step lower either (nor, when that is not realisable,
 * anywhere between there and the move).
 */
export function atWidthEdge(ctx: SolveContext, c: Candidate): Candidate {
  return pullToWidth(ctx, c, false) ?? c;
}

/**
 * A probe with every output device wider than the limit (or not realisable) pulled back, device by device from the
 * bottom, to the highest gm/ID at which it fits, searched over the whole range below its own; null when a device
 * fits at no allowed gm/ID.
 */
export function toWidthLimit(ctx: SolveContext, c: Candidate): Candidate | null {
  return pullToWidth(ctx, c, true);
}

/** The two above: the fitting gm/ID looked for one grid step below (`whole` false) or over the whole range below. */
function pullToWidth(ctx: SolveContext, c: Candidate, whole: boolean): Candidate | null {
  const w0 = candidateWidths(ctx, c);
  if (w0 && !anyWider(w0, ctx.wmax)) return c;
  const d: Candidate = { topology: c.topology, l: c.l, gmid: [...c.gmid], setpoints: c.setpoints };
  const fits = (k: number, g: number): boolean => fitsAt(ctx, d, k, g);
  for (let k = 0; k < c.gmid.length; k++) {
    const g = c.gmid[k];
    if (fits(k, g)) continue;
    let hi = g;
    let lo = NaN;
    if (!whole) {
      // Within one grid step below (where the climb's moves land). Not realisable there (a bottom diode's VGS at the
      // lower gm/ID leaving the device above no room), the stretch that fits can still lie between it and the move.
      const below = Math.max(ctx.gmids[0], g - ctx.gmidStep);
      const at = widthAt(ctx, d, k, below);
      if (at === 'fits') lo = below;
      else if (at === 'gone') [lo, hi] = fittingBetween(ctx, d, k, below, g);
    } else {
      // The highest grid gm/ID below that fits (scanned down: the lowest ones may not be realisable at all, e.g. a
      // bottom diode's VGS leaving the device above no room), then the edge between it and the next one up. Where none
      // fits, the stretch that does can lie between two grid points: the lowest too wide (`wide`) and the one below it,
      // not realisable (`gone`).
      let wide = NaN;
      let gone = NaN;
      for (let j = ctx.gmids.length - 1; j >= 0; j--) {
        const x = ctx.gmids[j];
        if (!(x < hi)) continue;
        const at = widthAt(ctx, d, k, x);
        if (at === 'fits') {
          lo = x;
          break;
        }
        hi = x;
        if (at === 'wide') [wide, gone] = [x, NaN];
        else if (!Number.isNaN(wide) && Number.isNaN(gone)) gone = x;
      }
      if (Number.isNaN(lo) && !Number.isNaN(gone)) [lo, hi] = fittingBetween(ctx, d, k, gone, wide);
    }
    if (Number.isNaN(lo)) return null;
    edgeGmid(ctx, d, k, lo, hi, EDGE_STEPS);
  }
  return d;
}

/**
 * A gm/ID of device k that fits the width limit between `gone` (not realisable) and `wide` (realisable, too wide), by
 * bisection (EDGE_STEPS at most), with the too-wide end left: [fits, wide], or [NaN, wide] when none is found.
 */
function fittingBetween(ctx: SolveContext, d: Candidate, k: number, gone: number, wide: number): [number, number] {
  for (let it = 0; it < EDGE_STEPS; it++) {
    const m = 0.5 * (gone + wide);
    const at = widthAt(ctx, d, k, m);
    if (at === 'gone') gone = m;
    else if (at === 'wide') wide = m;
    else return [m, wide];
  }
  return [NaN, wide];
}

/**
 * `c` with device k raised to the highest gm/ID at which it fits the width limit, the others kept; null when it is
 * at the top of the range or does not fit at its own gm/ID. Where the limit binds the best designs keep their devices
 * on it, so a new length is worth most with the gm/ID that brings the device back to it.
 */
export function raisedToLimit(ctx: SolveContext, c: Candidate, k: number): Candidate | null {
  const gHi = ctx.gmids[ctx.gmids.length - 1];
  const g = c.gmid[k];
  const d: Candidate = { topology: c.topology, l: c.l, gmid: [...c.gmid], setpoints: c.setpoints };
  if (g >= gHi - 1e-9 || !fitsAt(ctx, d, k, g)) return null;
  if (!fitsAt(ctx, d, k, gHi)) edgeGmid(ctx, d, k, g, gHi, EDGE_STEPS);
  return d;
}

// Bisection steps of a device raised to the width limit (widestAt): the gm/ID range over 2^12, a few 1e-3 /V.
const RAISE_STEPS = 12;

/**
 * `d` (pulled to the width limit) with each device in turn, from the bottom, raised to the highest gm/ID at which it
 * fits the limit, the others kept (device `keep` excepted); null when it fits nowhere. At a fixed bias W = I/jd rises
 * with gm/ID (and a gm/ID beyond the length's reach counts as too wide), so that is an edge found by bisection. Raised
 * together, one device not realisable at its bias would leave no width to pull the others by.
 */
export function widestAt(ctx: SolveContext, d: Candidate, keep = -1): Candidate | null {
  const e = toWidthLimit(ctx, d);
  if (e === null) return null;
  const gHi = ctx.gmids[ctx.gmids.length - 1];
  const t: Candidate = { topology: e.topology, l: e.l, gmid: [...e.gmid], setpoints: e.setpoints };
  for (let k = 0; k < t.gmid.length; k++) {
    const lo = e.gmid[k];
    if (k === keep) continue;
    if (lo >= gHi - 1e-9 || fitsAt(ctx, t, k, gHi)) continue;
    edgeGmid(ctx, t, k, lo, gHi, RAISE_STEPS);
  }
  return t;
}

/**
 * `c` (device k made longer) with device k's gm/ID lowered to where its area W·L is `area` again, the others kept, by
 * bisection (RAISE_STEPS): at a fixed bias W = I/jd rises with gm/ID, so a lower one narrows the device. Null when it
 * is no larger at its own gm/ID (the move needs no such change) or larger at every lower one.
 */
export function atArea(ctx: SolveContext, c: Candidate, k: number, area: number): Candidate | null {
  const d: Candidate = { topology: c.topology, l: c.l, gmid: [...c.gmid], setpoints: c.setpoints };
  const within = (g: number): boolean => {
    d.gmid[k] = g;
    const w = candidateWidths(ctx, d);
    return w !== null && w[k] * d.l[k] <= area;
  };
  let hi = c.gmid[k];
  if (within(hi)) return null;
  // The highest grid gm/ID below that is within (scanned down: the lowest may not be realisable), then the edge above it.
  for (let j = ctx.gmids.length - 1; j >= 0; j--) {
    const x = ctx.gmids[j];
    if (!(x < hi)) continue;
    if (within(x)) {
      d.gmid[k] = Math.round(edgeOf(within, x, hi, RAISE_STEPS) * 1e9) / 1e9;
      return d;
    }
    hi = x;
  }
  return null;
}

/**
 * Device k of `d` fits the width limit at gm/ID g (left in d.gmid[k]), the other devices as they are. Not realisable
 * counts as too wide (a gm/ID beyond what the length reaches at its bias: W = I/jd grows without bound towards it), as
 * in the exhaustive reference's width edge.
 */
export function fitsAt(ctx: SolveContext, d: Candidate, k: number, g: number): boolean {
  return widthAt(ctx, d, k, g) === 'fits';
}

/** Device k of `d` at gm/ID g (left in d.gmid[k]), the others as they are: within the width limit, wider, or not realisable. */
function widthAt(ctx: SolveContext, d: Candidate, k: number, g: number): 'fits' | 'wide' | 'gone' {
  d.gmid[k] = g;
  const w = candidateWidths(ctx, d);
  return w === null ? 'gone' : w[k] <= ctx.wmax ? 'fits' : 'wide';
}

/**
 * The edge of the width limit along device k's gm/ID between `lo` (fits) and `hi` (does not), by `steps` bisections:
 * at a fixed bias W = I/jd rises with gm/ID. The fitting end is left in d.gmid[k] and returned.
 */
export function edgeGmid(ctx: SolveContext, d: Candidate, k: number, lo: number, hi: number, steps: number): number {
  const g = edgeOf((m) => fitsAt(ctx, d, k, m), lo, hi, steps);
  d.gmid[k] = g;
  return g;
}

/** Some device of `w` is wider than `wmax`. */
export function anyWider(w: ArrayLike<number>, wmax: number): boolean {
  for (let k = 0; k < w.length; k++) if (w[k] > wmax) return true;
  return false;
}

/** Each candidate pulled back to the width limit (toWidthLimit), once per distinct result; one that fits nowhere is dropped. */
export function pulledToLimit(ctx: SolveContext, cands: Iterable<Candidate>): Candidate[] {
  const out: Candidate[] = [];
  const ids = new CandidateIds();
  for (const c of cands) {
    const d = toWidthLimit(ctx, c);
    if (d && ids.fresh(d)) out.push(d);
  }
  return out;
}
