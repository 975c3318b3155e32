// One array of doubles per length, copied: a copy is born with unboxed storage of exactly that length (an empty
// array grown by push, or `new Array(n)` filled with doubles, first gets storage of another kind or size).
const templates: number[][] = [];

/** A new array of `n` numbers (contents unspecified until written), stored unboxed. */
export function doubles(n: number): number[] {
  let t = templates[n];
  if (t === undefined) {
    // Built by push: packed storage (no holes to check on reads), which the copies keep.
    t = [];
    for (let k = 0; k < n; k++) t.push(0.5);
    templates[n] = t;
  }
  return t.slice();
}
