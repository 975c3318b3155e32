/** One evaluation of a bracketed test: whether it holds at x, by what margin (≥ 0 when it holds; NaN: unknown), and what was solved there. */
export interface Trial<S> {
  x: number;
  holds: boolean;
  margin: number;
  sample: S;
}

/**
 * The answer that bisecting [hold.x, fail.x] down to `res` gives, with fewer trials. Bisection halves the bracket
 * K times (until it is no wider than `res`), keeps the end where the test holds and returns it: one of the 2^K + 1
 * points of its own halving grid. When the test holds on one side of a single crossing and fails on the other,
 * that point is the last grid point from `hold` on which it holds, so it is searched for by index: regula falsi on
 * the margins (Illinois weighting: an end kept twice in a row weighs half; common practice for bracketed roots),
 * each trial at a grid point computed by the bisection's own arithmetic, with a halving step after two
 * interpolated steps in a row moved the same end, after a trial without a margin, and always after K trials. A
 * smooth margin then needs two or three trials where bisection needs K.
 *
 * `trial(x, hold, fail)` evaluates the test at x, given the nearest trials on either side (to start a solve from).
 * `known` is a trial the caller made anyway, anywhere: inside the bracket it narrows it (when the grid point the
 * answer falls on was only known to hold through it, that point is tried before it is returned). Returns the
 * trial at the answer (`hold` itself when nothing on the grid beyond it holds).
 *
 * @example bisectionAnswer(t(0), t(1), 1 / 64, (x) => t(x)) // with t(x) holding for x ≤ 0.3: the trial at 19/64
 */
export function bisectionAnswer<S>(
  hold: Trial<S>, fail: Trial<S>, res: number,
  trial: (x: number, hold: Trial<S>, fail: Trial<S>) => Trial<S>, known?: Trial<S>,
): Trial<S> {
  const inside = hold.x;
  const outside = fail.x;
  let k = 0;
  for (let w = Math.abs(outside - inside); w > res; w *= 0.5) k++;
  const leaves = 2 ** k;
  // Grid point `idx` (0 … 2^K, 0 at `hold`) by the bisection's own arithmetic (halving along idx's path).
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
  // Index of the last grid point no further from `hold` than x.
  const before = (x: number): number => {
    let lo = 0;
    let hi = leaves;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (Math.abs(pointAt(mid) - inside) <= Math.abs(x - inside)) lo = mid;
      else hi = mid;
    }
    return lo;
  };
  const holdMargin = (m: number) => Math.max(m, 0);
  const failMargin = (m: number) => Math.min(m, 0) - 1e-300;
  let lo = 0;
  let hi = leaves;
  let atLo = hold;
  let atHi = fail;
  // The furthest grid point a trial held at, and that trial (`lo` may be further, known to hold only through `known`).
  let solvedLo = 0;
  let atSolved = hold;
  let flo = holdMargin(hold.margin);
  let fhi = failMargin(fail.margin);
  if (known && Math.abs(known.x - inside) < Math.abs(outside - inside) && Math.sign(known.x - inside) === Math.sign(outside - inside)) {
    const j = before(known.x);
    if (known.holds && j > lo) {
      lo = j;
      flo = holdMargin(known.margin);
      atLo = known;
    } else if (!known.holds && j + 1 < hi) {
      hi = j + 1;
      fhi = failMargin(known.margin);
      atHi = known;
    }
  }
  let side = 0;
  let interpolate = true;
  let trials = 0;
  for (;;) {
    while (hi - lo > 1) {
      let idx: number;
      const t = flo / (flo - fhi);
      if (interpolate && trials < k && Number.isFinite(t)) idx = Math.min(hi - 1, Math.max(lo + 1, Math.floor(lo + t * (hi - lo))));
      else idx = (lo + hi) >> 1;
      const p = trial(pointAt(idx), atLo, atHi);
      trials++;
      const was = side;
      // The test decides; the margin only steers the next step.
      if (p.holds) {
        lo = idx;
        solvedLo = idx;
        atSolved = p;
        atLo = p;
        flo = holdMargin(p.margin);
        if (side === 1) fhi *= 0.5;
        side = 1;
      } else {
        hi = idx;
        atHi = p;
        fhi = failMargin(p.margin);
        if (side === -1) flo *= 0.5;
        side = -1;
      }
      interpolate = (!interpolate || was !== side) && !Number.isNaN(p.margin);
    }
    if (lo === solvedLo) return atSolved;
    // `lo` holds only by the known trial (off the grid): try the grid point itself.
    const p = trial(pointAt(lo), atLo, atHi);
    if (p.holds) return p;
    hi = lo;
    atHi = p;
    fhi = failMargin(p.margin);
    lo = solvedLo;
    atLo = atSolved;
    flo = holdMargin(atLo.margin);
    interpolate = false;
  }
}
