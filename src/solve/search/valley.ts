import type { SolveContext } from '../context.js';
import { fullyOk, type Evaluated } from '../evaluate/evaluate.js';
import { topologyOf } from '../../topology/index.js';
import { coordinates, gmidInRange, SETPOINT_MIN, type Candidate } from './candidate.js';
import { better } from './rank.js';
import { evaluateToPool, refine, type Seen } from './refine.js';
import { withCoordinate } from './ridge.js';

// Slides per search at most, and the finest step of a row's search as a fraction of its first (the climb's finest).
const SLIDES = 12;
const ROW_FINEST = 1 / 4;
// Lengths of a slide, in half grid steps: the longer ones only when no shorter one improves. Headroom ranks to 1 mV
// (ties settled by area), and along a shallow valley a half step gains less than that: the climb ends on a plateau of
// the rounded headroom, at its smallest area (random audit seed 20261332 #63: the valley falls 1 mV per 1 /V of the
// bottom's gm/ID, and no slide of half a grid step from 16.2 /V gained; the best design sits at 25.9 /V, 11 mV lower).
const STRIDES = [1, 2, 4];

/**
 * With objective Rout or headroom: slides along a diagonal valley of two continuous coordinates of the climbs' answer
 * (valleyRows). The best designs there often lie along a curve on which one coordinate rises while the other falls at
 * a rate the climb's pair moves (equal steps of each) do not follow: of a stacked cascode's two gm/IDs, one rising while
 * the other falls several times as fast (audit3: a weakly inverted bottom under a strongly inverted top, the headroom
 * kept at its target by the current window, or at the kink where VGS1 + VDSsat2 gives way to the Rout target); of a
 * lower device's gm/ID and its own setpoint, the best setpoint falling as the gm/ID rises (random audit seed 20261391
 * #91: a reed180 p triple's bottom from 18 to 20.5 /V, its best VDS from 243 to 225 mV, 8 mV less headroom; the gm/ID
 * alone gains under 1 mV). No move of one coordinate improves there, a pair move of the climb's steps leaves the
 * valley, and the ridge step's differences read the headroom's 1 mV resolution as flat. A slide moves one coordinate
 * by half its climb step and searches the other along its line for the best design there (by rank.ts `better`), so it
 * follows the valley at any slope. Slides repeat while one improves (the last direction that did tried first), then a
 * climb polishes the answer.
 */
export function alongValley(ctx: SolveContext, best: Evaluated, seen: Seen, pool: Evaluated[]): Evaluated {
  const c = best.cand;
  if (ctx.meetOnly || ctx.spec.objective === 'area' || !fullyOk(ctx, best)) return best;
  const rows = valleyRows(c);
  if (rows.length === 0) return best;
  const n = c.gmid.length;
  const stepOf = (k: number) => (k < n ? ctx.gmidStep / 2 : topologyOf(c.topology).refineVoltageStep / 2);
  const allowed = (k: number, x: number) => (k < n ? gmidInRange(ctx, x) : x >= SETPOINT_MIN);
  const evaluate = (d: Candidate): Evaluated | null => evaluateToPool(ctx, d, seen, pool);
  let first = 0;
  let moved = false;
  for (let slide = 0; slide < SLIDES; slide++) {
    let next: Evaluated | null = null;
    for (let s = 0; s < STRIDES.length && !next; s++) {
      for (let r = 0; r < rows.length && !next; r++) {
        const row = (first + r) % rows.length;
        const [a, sign, b] = rows[row];
        const x = coordinates(best.cand)[a] + sign * STRIDES[s] * stepOf(a);
        if (!allowed(a, x)) continue;
        const e = lineBest(withCoordinate(best.cand, a, x), b, stepOf(b), (y) => allowed(b, y), evaluate, (p, q) => better(ctx, p, q));
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
 * The rows of alongValley's slides: the continuous coordinate slid (candidate.ts `coordinates`), the sign of its slide,
 * and the coordinate searched. Of a design with two devices and no setpoint (a stacked cascode), its two gm/IDs, each
 * slid either way (the bottom's up first, the top's down, the bottom's down, the top's up); else each lower device's
 * gm/ID slid either way with its own setpoint (its VDS) searched, the bottom's first.
 */
function valleyRows(c: Candidate): [number, number, number][] {
  const n = c.gmid.length;
  if (c.setpoints.length === 0) return n === 2 ? [[0, 1, 1], [1, -1, 0], [0, -1, 1], [1, 1, 0]] : [];
  return c.setpoints.flatMap((_, k): [number, number, number][] => [[k, 1, n + k], [k, -1, n + k]]);
}

/**
 * The best design along coordinate b from `from` (by `better`): the better direction one `step` away, steps doubling
 * while they improve, then halving around the best down to ROW_FINEST of a step. `allowed`: b's range.
 */
function lineBest(
  from: Candidate, b: number, step: number, allowed: (x: number) => boolean, evaluate: (c: Candidate) => Evaluated | null,
  better: (a: Evaluated, b: Evaluated) => boolean,
): Evaluated | null {
  const at = (g: number): Evaluated | null => (allowed(g) ? evaluate(withCoordinate(from, b, g)) : null);
  const wins = (e: Evaluated | null, than: Evaluated | null): e is Evaluated => e !== null && (than === null || better(e, than));
  let x = coordinates(from)[b];
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
