import { bisectionAnswer, type Trial } from '../numeric/bisection-answer.js';

/**
 * A swing edge to a resolution: the answer bisecting [inside, outside] to `res` gives (the last point of its
 * halving grid from `inside` where the gain still meets the target), found with regula falsi on the log of gain
 * over target (bisectionAnswer), so a smooth gain needs two or three solves. `solve(v, near)` solves the circuit at
 * output v from a solved point nearby (the last one inside the edge).
 */
export function swingEdge<S extends { gain: number }>(
  solve: (v: number, near: S | null) => S | null,
  inside: number, outside: number, gIn: number, gOut: number, target: number, res: number, near: S | null,
): number {
  const at = (x: number, p: S | null): Trial<S | null> => ({
    x, holds: p !== null && p.gain >= target, margin: p && p.gain > 0 ? Math.log(p.gain / target) : NaN, sample: p,
  });
  const hold: Trial<S | null> = { x: inside, holds: true, margin: Math.log(gIn / target), sample: near };
  const fail: Trial<S | null> = { x: outside, holds: false, margin: gOut > 0 ? Math.log(gOut / target) : NaN, sample: null };
  return bisectionAnswer(hold, fail, res, (x, h) => at(x, solve(x, h.sample))).x;
}
