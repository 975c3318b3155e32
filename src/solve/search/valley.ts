import type { SolveContext } from '../context.js';
import { fullyOk, type Evaluated } from '../evaluate/evaluate.js';
import { gmidInRange, withGmid, type Candidate } from './candidate.js';
import { better } from './rank.js';
import { evaluateToPool, refine, type Seen } from './refine.js';

// Slides per search at most, and the finest step of a row's search as a fraction of its first (the climb's finest).
const SLIDES = 12;
const ROW_FINEST = 1 / 4;
// Lengths of a slide, in half grid steps: the longer ones only when no shorter one improves. Headroom ranks to 1 mV
// (ties settled by area), and along a shallow valley a half step gains less than that: the climb ends on a plateau of
// the rounded headroom, at its smallest area (random audit seed 20261332 #63: the valley falls 1 mV per 1 /V of the
// bottom's gm/ID, and no slide of half a grid step from 16.2 /V gained; the best design sits at 25.9 /V, 11 mV lower).
const STRIDES = [1, 2, 4];

/**
 * With objective Rout or headroom, where the climbs' answer has two continuous coordinates (the two gm/IDs of a
 * stacked cascode): slides along a diagonal valley. The best designs there often lie along a curve on which one gm/ID
 * rises while the other falls several times as fast (audit3: a weakly inverted bottom under a strongly inverted top,
 * the headroom kept at its target by the current window, or at the kink where VGS1 + VDSsat2 gives way to the Rout
 * target). No move of one coordinate improves there, a pair move of equal steps leaves the valley, and the ridge step's
 * differences read the headroom's 1 mV resolution as flat. A slide moves one gm/ID by half a grid step and searches the
 * other along its line for the best design there (by rank.ts `better`), so it follows the valley at any slope.
 * Slides repeat while one improves (the last direction that did tried first), then a climb polishes the answer.
 */
export function alongValley(ctx: SolveContext, best: Evaluated, seen: Seen, pool: Evaluated[]): Evaluated {
  const c = best.cand;
  if (ctx.meetOnly || ctx.spec.objective === 'area' || c.gmid.length !== 2 || c.setpoints.length !== 0 || !fullyOk(ctx, best)) return best;
  const step = ctx.gmidStep / 2;
  const evaluate = (d: Candidate): Evaluated | null => evaluateToPool(ctx, d, seen, pool);
  // Rows: the device moved and the sign of its move.
  const rows: [number, number][] = [[0, 1], [1, -1], [0, -1], [1, 1]];
  let first = 0;
  let moved = false;
  for (let slide = 0; slide < SLIDES; slide++) {
    let next: Evaluated | null = null;
    for (let s = 0; s < STRIDES.length && !next; s++) {
      for (let r = 0; r < rows.length && !next; r++) {
        const row = (first + r) % rows.length;
        const [a, sign] = rows[row];
        const x = best.cand.gmid[a] + sign * STRIDES[s] * step;
        if (!gmidInRange(ctx, x)) continue;
        const e = lineBest(ctx, withGmid(best.cand, a, x), 1 - a, step, evaluate);
        if (e && better(ctx, e, best)) {
          next = e;
          first = row;
        }
      }
    }
    if (!next) break;
    best = next;
    moved = true;
  }
  return moved ? (refine(ctx, [best], seen, pool) ?? best) : best;
}

/**
 * The best design along device b's gm/ID from `from` (by `better`): the better direction one `step` away, steps
 * doubling while they improve, then halving around the best down to ROW_FINEST of a step.
 */
function lineBest(ctx: SolveContext, from: Candidate, b: number, step: number, evaluate: (c: Candidate) => Evaluated | null): Evaluated | null {
  const at = (g: number): Evaluated | null => (gmidInRange(ctx, g) ? evaluate(withGmid(from, b, g)) : null);
  const wins = (e: Evaluated | null, than: Evaluated | null): e is Evaluated => e !== null && (than === null || better(ctx, e, than));
  let x = from.gmid[b];
  let cur = at(x);
  let dir = 0;
  for (const s of [-1, 1]) {
    const e = at(x + s * step);
    if (wins(e, cur)) {
      cur = e;
      dir = s;
    }
  }
  let t = step;
  if (dir !== 0) {
    x += dir * step;
    for (let e = at(x + dir * 2 * t); wins(e, cur); e = at(x + dir * 2 * t)) {
      t *= 2;
      x += dir * t;
      cur = e;
    }
  }
  for (t /= 2; t >= step * ROW_FINEST - 1e-12; t /= 2) {
    for (const s of [-1, 1]) {
      const e = at(x + s * t);
      if (wins(e, cur)) {
        cur = e;
        x += s * t;
        break;
      }
    }
  }
  return cur;
}
