import type { StagePoint } from './stage-point.js';

/**
 * A swing edge to a resolution, with the same answer as bisecting [inside,
 * outside] to `res` but fewer DC solves. Bisection ends on one of the 2^K
 * leaves of its interval tree (K halvings bring the width to `res`) and
 * returns the leaf end nearer the inside, where the gain still meets the
 * target while the other end misses it. Here the leaf is searched by index:
 * regula falsi on the log of gain over target (Illinois weighting; a halving
 * step after two interpolated steps in a row moved the same end, after an
 * unsolvable point, and always after K solves), each point taken as
 * bisection would compute it, so a smooth gain needs two or three solves.
 * `solve(v, near)` solves the circuit at output v from a solved point nearby.
 */
export function swingEdge(
  solve: (v: number, near: StagePoint | null) => StagePoint | null,
  inside: number, outside: number, gIn: number, gOut: number, target: number, res: number, near: StagePoint | null,
): number {
  let k = 0;
  for (let w = Math.abs(outside - inside); w > res; w *= 0.5) k++;
  const leaves = 2 ** k;
  // The leaf end `idx` (0 … 2^K) by the bisection's own arithmetic (halving along idx's path).
  const pointAt = (idx: number): number => {
    if (idx >= leaves) return outside;
    let a = inside;
    let b = outside;
    for (let level = k - 1; level >= 0; level--) {
      const m = 0.5 * (a + b);
      if ((idx >> level) & 1) a = m;
      else b = m;
    }
    return a;
  };
  let lo = 0;
  let hi = leaves;
  let flo = Math.log(gIn / target);
  let fhi = gOut > 0 ? Math.min(Math.log(gOut / target), 0) - 1e-300 : NaN;
  let side = 0;
  let interpolate = true;
  let solves = 0;
  while (hi - lo > 1) {
    let idx: number;
    const t = flo / (flo - fhi);
    if (interpolate && solves < k && Number.isFinite(t)) idx = Math.min(hi - 1, Math.max(lo + 1, Math.floor(lo + t * (hi - lo))));
    else idx = (lo + hi) >> 1;
    const p = solve(pointAt(idx), near);
    solves++;
    const f = p && p.gain > 0 ? Math.log(p.gain / target) : NaN;
    const was = side;
    // The gain itself decides (the log only steers the next step).
    if (p && p.gain >= target) {
      lo = idx;
      flo = Math.max(f, 0);
      near = p;
      if (side === 1) fhi *= 0.5;
      side = 1;
    } else {
      hi = idx;
      fhi = Math.min(f, 0) - 1e-300;
      if (side === -1) flo *= 0.5;
      side = -1;
    }
    interpolate = (!interpolate || was !== side) && !Number.isNaN(f);
  }
  return pointAt(lo);
}
