/** One inequality a·x ≤ b of a linear programme. */
export interface LpRow {
  a: Float64Array;
  b: number;
}

/**
 * min c·x subject to a_i·x ≤ b_i (like scipy.optimize.linprog with only A_ub, b_ub and free bounds), by trying every
 * vertex (d of the rows held as equalities) and keeping the best feasible one. For the small problems of a ridge step
 * (up to five unknowns, about sixteen rows); the rows must bound the feasible set. null when no vertex is feasible.
 */
export function vertexLp(c: ArrayLike<number>, rows: readonly LpRow[], d: number): { x: Float64Array; value: number } | null {
  let best: Float64Array | null = null;
  let bestValue = Infinity;
  const pick: number[] = [];
  const visit = (from: number): void => {
    if (pick.length === d) {
      const v = solveRows(rows, pick, d);
      if (!v) return;
      for (const r of rows) if (dot(r.a, v) > r.b + 1e-9 * (1 + Math.abs(r.b))) return;
      const value = dot(c, v);
      if (value < bestValue) {
        bestValue = value;
        best = v;
      }
      return;
    }
    for (let i = from; i <= rows.length - (d - pick.length); i++) {
      pick.push(i);
      visit(i + 1);
      pick.pop();
    }
  };
  visit(0);
  return best ? { x: best, value: bestValue } : null;
}

function dot(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let s = 0;
  for (let k = 0; k < a.length; k++) s += a[k] * b[k];
  return s;
}

/** The chosen rows as equalities, by Gaussian elimination with partial pivoting; null when singular. */
function solveRows(rows: readonly LpRow[], pick: readonly number[], d: number): Float64Array | null {
  const m = pick.map((i) => [...rows[i].a, rows[i].b]);
  for (let col = 0; col < d; col++) {
    let p = col;
    for (let r = col + 1; r < d; r++) if (Math.abs(m[r][col]) > Math.abs(m[p][col])) p = r;
    if (Math.abs(m[p][col]) < 1e-12) return null;
    const t = m[col];
    m[col] = m[p];
    m[p] = t;
    for (let r = 0; r < d; r++) {
      if (r === col) continue;
      const f = m[r][col] / m[col][col];
      if (f !== 0) for (let k = col; k <= d; k++) m[r][k] -= f * m[col][k];
    }
  }
  const v = new Float64Array(d);
  for (let k = 0; k < d; k++) v[k] = m[k][d] / m[k][k];
  return v;
}
