/** One inequality a·x ≤ b of a linear programme. */
export interface LpRow {
  a: Float64Array;
  b: number;
}

/**
 * min c·x subject to a_i·x ≤ b_i (like scipy.optimize.linprog with only A_ub, b_ub and free bounds): the best vertex
 * (d of the rows held as equalities), the first in the order of the rows' indices among equals. For the small problems
 * of a ridge step (up to five unknowns, about sixteen rows); the rows must bound the feasible set. null when no vertex
 * is feasible.
 *
 * Where x = 0 is feasible (every b ≥ 0, as in a ridge step), the simplex method (Bland's rule, so it cannot cycle)
 * finds an optimal vertex in a few pivots, and the vertex is then computed from the rows that hold there exactly as
 * trying every vertex computes it. Otherwise, or when the simplex meets numerical trouble, every vertex is tried
 * (thousands of small solves). Where the optimum is a face, not one vertex, the two may answer different vertices of it.
 */
export function vertexLp(c: ArrayLike<number>, rows: readonly LpRow[], d: number): { x: Float64Array; value: number } | null {
  const tight = rows.every((r) => r.b >= 0) ? simplexTight(c, rows, d) : null;
  return (tight && bestVertex(c, rows, d, tight)) ?? bestVertex(c, rows, d, null);
}

/** The best feasible vertex made of the rows in `among` (all rows when null), by trying each pick of d of them. */
function bestVertex(c: ArrayLike<number>, rows: readonly LpRow[], d: number, among: readonly number[] | null): { x: Float64Array; value: number } | null {
  const idx = among ?? rows.map((_, i) => i);
  let best: Float64Array | null = null;
  let bestValue = Infinity;
  const pick = new Int32Array(d);
  // One matrix and one answer for every trial (thousands of them per call).
  const m = Array.from({ length: d }, () => new Float64Array(d + 1));
  const v = new Float64Array(d);
  // A row and its opposite (a box's two sides) never make a vertex together: picks holding both are skipped (with
  // only d rows to pick from there is one pick, tried as it is).
  const opposite = idx.length > d ? oppositeRows(rows) : null;
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
    for (let j = from; j <= idx.length - (d - depth); j++) {
      const i = idx[j];
      if (opposite && opposite[i] >= 0 && opposite[i] < i && picked(pick, depth, opposite[i])) continue;
      pick[depth] = i;
      visit(depth + 1, j + 1);
    }
  };
  visit(0, 0);
  return best ? { x: best, value: bestValue } : null;
}

// Pivots below this (relative to the column's largest entry) are taken as zero.
const PIVOT_EPS = 1e-11;

/**
 * The rows holding at the optimal vertex the simplex method finds from x = 0 (feasible: every b ≥ 0), in index order;
 * null when it cannot tell (unbounded, too many pivots, or a pivot too small to trust).
 * Tableau of A x + s = b with x free and s ≥ 0; a free variable that enters the basis never leaves it, and one whose
 * reduced cost is zero is pivoted in at the end anyway, so the answer is a vertex (d rows hold).
 */
function simplexTight(c: ArrayLike<number>, rows: readonly LpRow[], d: number): number[] | null {
  const nr = rows.length;
  const w = d + nr + 1;
  const t = new Float64Array(nr * w);
  const z = new Float64Array(w);
  // basis[i]: the variable of row i (x_k = k, slack of row j = d + j).
  const basis = new Int32Array(nr);
  for (let i = 0; i < nr; i++) {
    for (let k = 0; k < d; k++) t[i * w + k] = rows[i].a[k];
    t[i * w + d + i] = 1;
    t[i * w + w - 1] = rows[i].b;
    basis[i] = d + i;
  }
  for (let k = 0; k < d; k++) z[k] = c[k];
  const isBasic = (j: number) => basis.indexOf(j) >= 0;
  // Moves variable j by `dir` until a slack in the basis reaches zero; false when nothing limits it or the pivot is unsafe.
  const enter = (j: number, dir: number): boolean => {
    let r = -1;
    let ratio = Infinity;
    let scale = 0;
    for (let i = 0; i < nr; i++) scale = Math.max(scale, Math.abs(t[i * w + j]));
    for (let i = 0; i < nr; i++) {
      if (basis[i] < d) continue;
      const a = dir * t[i * w + j];
      if (!(a > PIVOT_EPS * scale)) continue;
      const q = Math.max(t[i * w + w - 1], 0) / a;
      if (q < ratio || (q === ratio && basis[i] < basis[r])) {
        ratio = q;
        r = i;
      }
    }
    if (r < 0) return false;
    pivot(t, z, w, nr, r, j);
    basis[r] = j;
    return true;
  };
  for (let iter = 0; ; iter++) {
    if (iter > 50 * (nr + d)) return null;
    // Bland's rule: the lowest-numbered variable that improves the objective enters.
    let j = -1;
    let dir = 0;
    let zs = 1;
    for (let k = 0; k < w - 1; k++) zs = Math.max(zs, Math.abs(z[k]));
    for (let k = 0; k < w - 1 && j < 0; k++) {
      if (isBasic(k)) continue;
      if (k < d ? Math.abs(z[k]) > 1e-12 * zs : z[k] < -1e-12 * zs) {
        j = k;
        dir = z[k] > 0 ? -1 : 1;
      }
    }
    if (j < 0) break;
    if (!enter(j, dir)) return null;
  }
  // Free variables left out of the basis (zero reduced cost) are pivoted in, so that d rows hold.
  for (let k = 0; k < d; k++) if (!isBasic(k) && !enter(k, 1) && !enter(k, -1)) return null;
  const tight: number[] = [];
  for (let i = 0; i < nr; i++) {
    const slack = isBasic(d + i) ? t[basis.indexOf(d + i) * w + w - 1] : 0;
    if (slack <= 1e-9 * (1 + Math.abs(rows[i].b))) tight.push(i);
  }
  return tight.length >= d ? tight : null;
}

/** Gauss–Jordan pivot of the tableau `t` (rows of width `w`) and its objective row `z` on row r, column j. */
function pivot(t: Float64Array, z: Float64Array, w: number, nr: number, r: number, j: number): void {
  const p = t[r * w + j];
  for (let k = 0; k < w; k++) t[r * w + k] /= p;
  for (let i = 0; i < nr; i++) {
    if (i === r) continue;
    const f = t[i * w + j];
    if (f !== 0) for (let k = 0; k < w; k++) t[i * w + k] -= f * t[r * w + k];
  }
  const f = z[j];
  if (f !== 0) for (let k = 0; k < w; k++) z[k] -= f * t[r * w + k];
}

/** For each row, the index of a row with the opposite normal (−a), −1 when none. */
function oppositeRows(rows: readonly LpRow[]): Int32Array {
  const out = new Int32Array(rows.length).fill(-1);
  for (let i = 0; i < rows.length; i++) {
    for (let j = 0; j < i && out[i] < 0; j++) if (isOpposite(rows[i].a, rows[j].a)) out[i] = j;
  }
  return out;
}

function isOpposite(a: Float64Array, b: Float64Array): boolean {
  for (let k = 0; k < a.length; k++) if (a[k] !== -b[k]) return false;
  return true;
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
 * null when infeasible. The ridge step's programme when at most one margin can bind (vertexLp serves the others); among
 * equally good answers it takes its own (a zero-cost coordinate at the bound the row prefers), which vertexLp need not.
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
