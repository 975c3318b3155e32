import type { StageOption } from './types.js';

/**
 * The bottom devices one (top, middle) pair could want, found without trying
 * them all: with Rout ≈ a + b·ro_bottom, area adding up and headroom set by the
 * pair, the pools' best bottoms are the smallest-area one reaching the Rout
 * target (and twice it) within the mismatch budget, and the highest-ro one
 * within the budget and overall. Sorted by ro with suffix minima of area, each
 * is a binary search.
 */
export class BottomFinder {
  private ro: Float64Array;
  private best: StageOption[];
  private maxOk: StageOption | undefined;
  private maxAll: StageOption | undefined;
  constructor(bottoms: readonly StageOption[], mismatch: number | undefined) {
    const ok = bottoms.filter((o) => mismatch === undefined || o.sigma <= mismatch).sort((x, y) => x.ro - y.ro);
    this.ro = Float64Array.from(ok, (o) => o.ro);
    this.best = new Array(ok.length);
    for (let j = ok.length - 1; j >= 0; j--) this.best[j] = j + 1 < ok.length && this.best[j + 1].area < ok[j].area ? this.best[j + 1] : ok[j];
    this.maxOk = ok[ok.length - 1];
    for (const o of bottoms) if (!this.maxAll || o.ro > this.maxAll.ro) this.maxAll = o;
  }

  /** Smallest-area bottom within the budget with ro ≥ need, if any. */
  private atLeast(need: number): StageOption | undefined {
    let lo = 0;
    let hi = this.ro.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (this.ro[mid] >= need) hi = mid;
      else lo = mid + 1;
    }
    return this.best[lo];
  }

  /** The distinct picks into `out` (reused between calls); returns how many. */
  picks(need: number, need2: number, out: StageOption[]): number {
    let n = add(out, 0, this.atLeast(need));
    n = add(out, n, this.atLeast(need2));
    n = add(out, n, this.maxOk);
    return add(out, n, this.maxAll);
  }
}

// Append o to the first n picks unless absent or already there; the new count (no closure: this runs per pair).
function add(out: StageOption[], n: number, o: StageOption | undefined): number {
  if (!o || (n > 0 && out[0] === o) || (n > 1 && out[1] === o) || (n > 2 && out[2] === o)) return n;
  out[n] = o;
  return n + 1;
}
