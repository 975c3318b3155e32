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
  const pick = new Int32Array(d);
  // One matrix and one answer for every trial (thousands of them per call).
  const m = Array.from({ length: d }, () => new Float64Array(d + 1));
  const v = new Float64Array(d);
  // A row and its opposite (a box's two sides) never make a vertex together: picks holding both are skipped.
  const opposite = oppositeRows(rows);
  const visit = (depth: number, from: number): void => {
    if (depth === d) {
      if (!solveRows(rows, pick, d, m, v)) return;
      for (let i = 0; i < rows.length; i++) if (dot(rows[i].a, v) > rows[i].b + 1e-9 * (1 + Math.abs(rows[i].b))) return;
      const value = dot(c, v);
      if (value < bestValue) {
        bestValue = value;
        best = Float64Array.from(v);
      }
      return;
    }
    for (let i = from; i <= rows.length - (d - depth); i++) {
      if (opposite[i] >= 0 && opposite[i] < i && picked(pick, depth, opposite[i])) continue;
      pick[depth] = i;
      visit(depth + 1, i + 1);
    }
  };
  visit(0, 0);
  return best ? { x: best, value: bestValue } : null;
}

/** For each row, the index of a row with the opposite normal (−a), −1 when none. */
function oppositeRows(rows: readonly LpRow[]): Int32Array {
  const out = new Int32Array(rows.length).fill(-1);
  for (let i = 0; i < rows.length; i++) {
    for (let j = 0; j < i && out[i] < 0; j++) if (rows[i].a.every((x, k) => x === -rows[j].a[k])) out[i] = j;
  }
  return out;
}

function picked(pick: Int32Array, depth: number, i: number): boolean {
  for (let t = 0; t < depth; t++) if (pick[t] === i) return true;
  return false;
}

function dot(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let s = 0;
  for (let k = 0; k < a.length; k++) s += a[k] * b[k];
  return s;
}

/** The picked rows as equalities into `v`, by Gaussian elimination with partial pivoting in `m`; false when singular. */
function solveRows(rows: readonly LpRow[], pick: Int32Array, d: number, m: Float64Array[], v: Float64Array): boolean {
  for (let r = 0; r < d; r++) {
    const row = rows[pick[r]];
    for (let k = 0; k < d; k++) m[r][k] = row.a[k];
    m[r][d] = row.b;
  }
  for (let col = 0; col < d; col++) {
    let p = col;
    for (let r = col + 1; r < d; r++) if (Math.abs(m[r][col]) > Math.abs(m[p][col])) p = r;
    if (Math.abs(m[p][col]) < 1e-12) return false;
    const t = m[col];
    m[col] = m[p];
    m[p] = t;
    for (let r = 0; r < d; r++) {
      if (r === col) continue;
      const f = m[r][col] / m[col][col];
      if (f !== 0) for (let k = col; k <= d; k++) m[r][k] -= f * m[col][k];
    }
  }
  for (let k = 0; k < d; k++) v[k] = m[k][d] / m[k][k];
  return true;
}

/**
 * min c·x subject to a·x ≤ b and −down ≤ x ≤ up (one row and a box), exactly, as a fractional knapsack: each
 * coordinate at the bound its cost prefers (a free one at the bound the row prefers), then, while the row is
 * violated, coordinates moved back towards their other bound in order of least cost per unit of the row removed.
 * null when infeasible. The ridge step's programme when at most one margin can bind: vertexLp tries every vertex,
 * 2^d and more of them (about a millisecond at d = 8, the stage's ridge over both sides).
 */
export function boxLp1(c: ArrayLike<number>, a: ArrayLike<number>, b: number, up: ArrayLike<number>, down: ArrayLike<number>): { x: Float64Array; value: number } | null {
  const d = c.length;
  const x = Float64Array.from({ length: d }, (_, k) => (c[k] < 0 || (c[k] === 0 && a[k] < 0) ? up[k] : -down[k]));
  let excess = dot(a, x) - b;
  // Moves that lower the row: coordinate, its cost per unit of the row, and how much of the row it can remove.
  const moves: { k: number; rate: number; room: number }[] = [];
  for (let k = 0; k < d; k++) {
    if (a[k] > 0 && x[k] > -down[k]) moves.push({ k, rate: -c[k] / a[k], room: a[k] * (x[k] + down[k]) });
    else if (a[k] < 0 && x[k] < up[k]) moves.push({ k, rate: c[k] / -a[k], room: -a[k] * (up[k] - x[k]) });
  }
  moves.sort((p, q) => p.rate - q.rate);
  for (const m of moves) {
    if (!(excess > 0)) break;
    const take = Math.min(m.room, excess);
    x[m.k] -= take / a[m.k];
    excess -= take;
  }
  if (excess > 1e-9 * (1 + Math.abs(b))) return null;
  return { x, value: dot(c, x) };
}
