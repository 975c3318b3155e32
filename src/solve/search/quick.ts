import { sampleAt } from '../../stack/index.js';
import { VOLT_SCALE, distanceToFeasible, marginsFor, type Margins } from '../../policy.js';
import { SCAN_INTERVALS } from '../evaluate/stack-eval.js';
import type { SolveContext } from '../context.js';
import { saturationMargin } from '../evaluate/checks.js';
import { pelgromSigma } from '../evaluate/mismatch.js';
import { rangeSafe, startOf, type Start } from '../evaluate/evaluate.js';
import type { Candidate } from './candidate.js';

// A Rout figure counts as surely below a value only this far below it, so the DC solve's own tolerance (the
// exact evaluation solves that point from another starting guess) cannot decide.
const ROUT_SLACK = 1e-3;

/** What a candidate's sizing and mid-span DC solve (plus one solve at the headroom target) surely show. */
export interface Look {
  /** The sizing and mid-span solve the look made: the exact evaluation continues from them (evaluateCandidate). */
  start: Start;
  /** Widest output device, m. */
  widest: number;
  /** The current window, the mismatch budget or a lower device's saturation is missed (margins fixed at mid-span). */
  midMiss: boolean;
  /** The margins fixed at mid-span and by the sizing: the exact evaluation's own (the same solve and widths). */
  fixed: Pick<Margins, 'iout' | 'mismatch' | 'saturation' | 'width'>;
  /**
   * Rout at the headroom target, Ω (NaN when not solved): the exact Rout figure (lowest over [target headroom,
   * span]) is at most this. One more DC solve, done on first use only.
   */
  routAtTargetHeadroom(): number;
  /** Rout at stack voltage v, Ω (NaN when not solved): one more DC solve per call. */
  routAt(v: number): number;
}

/**
 * The look at a candidate, from the start every exact evaluation makes (startOf: sizing, mid-span solve); null when it
 * cannot tell (not realisable, or a lower device below VDSsat when saturation is required: the exact evaluation
 * rejects those itself, cheaply).
 */
export function lookAt(ctx: SolveContext, c: Candidate): Look | null {
  return rangeSafe(() => look(ctx, c));
}

function look(ctx: SolveContext, c: Candidate): Look | null {
  const s = ctx.spec;
  const start = startOf(ctx, c);
  if (typeof start === 'string') return null;
  const { devices, sized, mid: m } = start;
  const widest = Math.max(...sized.w);
  const saturation = saturationMargin(m);
  if (saturation < 0 && ctx.saturation === 'require') return null;
  const b = m.mid.devices[0];
  const sigma = ctx.coeff ? pelgromSigma(b.gm / b.id, devices[0].w, devices[0].slice.l, ctx.coeff) : undefined;
  // As marginsOf makes them.
  const { iout, mismatch, width } = marginsFor(s, { rout: 0, headroom: Infinity, iout: m.mid.i, sigma, saturation, width: widest });
  const fixed = { iout, mismatch, saturation, width };
  const midMiss = iout < 0 || saturation < 0 || (s.mismatch !== undefined && sigma !== undefined && sigma > s.mismatch);
  const routAt = (v: number): number => {
    const at = rangeSafe(() => sampleAt(devices, sized.gates, v, m.mid));
    return at && Number.isFinite(at.rout) ? at.rout : NaN;
  };
  let rout: number | undefined;
  const routAtTargetHeadroom = (): number => (rout ??= routAt(s.headroom));
  return { start, widest, midMiss, fixed, routAtTargetHeadroom, routAt };
}

/** The look shows Rout at the headroom target surely below `r` (so the exact Rout figure is too). */
export function routSurelyBelow(l: Look, r: number): boolean {
  return l.routAtTargetHeadroom() < r * (1 - ROUT_SLACK);
}

/** The look shows Rout at stack voltage v surely below `r` (one more DC solve). */
export function routSurelyBelowAt(l: Look, v: number, r: number): boolean {
  return l.routAt(v) < r * (1 - ROUT_SLACK);
}

/**
 * The lowest point of the scan's voltage grid (SCAN_INTERVALS steps up to span, as stackCurve places them) at or
 * above v. Where a design's Rout misses the target at such a point, its exact headroom lies above the point (every
 * scanned point above the headroom holds, see headroomPoint; points below the headroom target the scan skips lie
 * below a failing one).
 */
export function scanPointAtOrAbove(span: number, v: number): number {
  const n = SCAN_INTERVALS;
  let j = Math.ceil((v * n) / span);
  while ((span * j) / n < v) j++;
  return (span * j) / n;
}

/**
 * The exact nominal shortfall (distanceToFeasible of the margins; other corners only add to a design's) is surely
 * above `x`: the fixed margins are the evaluation's own; Rout's is at least the miss at the headroom target (the
 * exact figure is the lowest over [target, span]); headroom's at least the distance to a scanned point where Rout
 * surely misses the target. DC solves only while the sum does not yet decide. Summed by distanceToFeasible itself,
 * so no term and no rounding of the sum is larger than the exact one's.
 */
export function shortfallSurelyAbove(ctx: SolveContext, l: Look, x: number): boolean {
  const f = l.fixed;
  const s = ctx.spec;
  const sum = (rout: number, headroom: number) => distanceToFeasible({ rout, headroom, ...f });
  const routMargin = (r: number) => (r > 0 ? Math.log((r * (1 + ROUT_SLACK)) / s.rout) : Infinity);
  if (sum(Infinity, Infinity) > x) return true;
  const rt = l.routAtTargetHeadroom();
  const known = sum(routMargin(rt), Infinity);
  if (known > x) return true;
  const need = x - known;
  if (!(need < 50)) return false;
  const v = scanPointAtOrAbove(s.span, s.headroom + need * VOLT_SCALE);
  if (!(v <= s.span)) return false;
  const rv = l.routAt(v);
  if (!(rv < s.rout * (1 - ROUT_SLACK))) return false;
  return sum(routMargin(Math.min(rt, rv)), (s.headroom - v) / VOLT_SCALE) > x;
}

/**
 * The look shows a sure miss of a nominal target: width, current window, σ, saturation, or Rout (at the headroom
 * target, a point of the exact figure's range).
 */
export function surelyMisses(ctx: SolveContext, l: Look): boolean {
  return l.midMiss || (ctx.spec.wmax !== undefined && l.widest > ctx.spec.wmax) || routSurelyBelow(l, ctx.spec.rout);
}
