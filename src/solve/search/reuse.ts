import type { SolveContext } from '../context.js';
import { marginsOf } from '../evaluate/checks.js';
import type { Evaluated } from '../evaluate/evaluate.js';
import type { Candidate } from './candidate.js';
import { CandidateMap } from './candidate-map.js';
import { SCAN_INTERVALS } from '../evaluate/stack-eval.js';

/** Exactly evaluated candidates by key (null: not realisable), shared by screen and refinement. */
export type Seen = CandidateMap<Evaluated | null>;

/**
 * Evaluations of one stack's candidates kept for searches under another width limit: the sizing, the DC solves
 * and σ do not depend on the limit, only the margins do, so a known evaluation is re-judged instead of repeated.
 */
export interface Reuse {
  /** A scan-level evaluation of the candidate (null: not realisable), undefined when none is known. */
  lookup(c: Candidate): Evaluated | null | undefined;
  store(c: Candidate, e: Evaluated | null): void;
}

/** Reuse over the evaluations of a finished search (`base`), plus those the later searches add. */
export function reuseOf(base: Seen): Reuse {
  const own: Seen = new CandidateMap();
  return {
    lookup(c) {
      const k = own.find(c);
      const e = own.has(k) ? own.get(k) : base.get(base.find(c));
      // A design finalized in place carries the full curve now, not the scan a fresh evaluation gives.
      return e && e.intervals !== SCAN_INTERVALS ? undefined : e;
    },
    store(c, e) {
      // A copy: the search that made it may finalize its own in place.
      own.set(own.key(c), e && { ...e });
    },
  };
}

/**
 * A known evaluation judged against this context's spec, as evaluateCandidate would return it: new margins,
 * corners left to compute, and null for a lower device below VDSsat when saturation is required (the base may
 * come from a search that only reported it).
 */
export function rejudged(ctx: SolveContext, e: Evaluated | null): Evaluated | null {
  if (!e) return null;
  const margins = marginsOf(ctx.spec, e.nominal, e.sigma);
  if (ctx.saturation === 'require' && margins.saturation < 0) return null;
  return { ...e, margins, corners: undefined };
}
