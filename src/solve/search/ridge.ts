import { coordinates, type Candidate } from './candidate.js';
import type { SolveContext } from '../context.js';
import { VOLT_SCALE, type Margins } from '../../policy.js';
import type { Evaluated } from '../evaluate/evaluate.js';
import { vertexLp, type LpRow } from '../../numeric/index.js';

// Margin (in the policy's units: 50 mV, ln Rout, …) a ridge step keeps where the design has it.
const KEEP = 0.02;

/**
 * One step along a ridge of the design space, for a climb stuck where several targets bind at once: no move of one or
 * two coordinates by the climb's steps keeps every target met and improves the objective, though a move of three or
 * more in the right proportions would (e.g. a bottom gm/ID raised, its setpoint lowered and the top's gm/ID lowered,
 * each by its own amount). From forward differences of the objective and the margins in each continuous coordinate
 * (gm/ID per device, setpoints), the linearised problem (objective down, every margin kept ≥ 0, each coordinate
 * within `box` steps `h`) is solved as a small linear programme, and its answer tried; on failure again within half and
 * a quarter of the box (sequential linear programming with a trust region, common practice). Returns the first try
 * `better` prefers to `best`, or null. `lo`, `hi`: limits of each coordinate.
 */
export function ridgeStep(
  best: Evaluated, h: readonly number[], box: number, lo: readonly number[], hi: readonly number[],
  evaluate: (c: Candidate) => Evaluated | null, better: (a: Evaluated, b: Evaluated) => boolean, objective: SolveContext['spec']['objective'],
): Evaluated | null {
  const x = coordinates(best.cand);
  const d = x.length;
  const f0 = objectiveOf(best, objective);
  const m0 = marginList(best.margins);
  const gradF = new Float64Array(d);
  const gradM = m0.map(() => new Float64Array(d));
  const free: boolean[] = [];
  for (let k = 0; k < d; k++) {
    // Forward difference, else backward where the forward point cannot be realised (or leaves a margin undefined).
    let dk = h[k];
    let e = x[k] + dk <= hi[k] ? evaluate(withCoordinate(best.cand, k, x[k] + dk)) : null;
    if (!usable(e, m0)) {
      dk = -h[k];
      e = x[k] + dk >= lo[k] ? evaluate(withCoordinate(best.cand, k, x[k] + dk)) : null;
    }
    free.push(usable(e, m0));
    if (!usable(e, m0)) continue;
    gradF[k] = (objectiveOf(e!, objective) - f0) / dk;
    const m = marginList(e!.margins);
    for (let j = 0; j < m0.length; j++) gradM[j][k] = (m[j] - m0[j]) / dk;
  }
  // Half-spaces a·δ ≤ b: the linearised margins; the box is added per try, halved after each failed one.
  const rows: LpRow[] = [];
  // Each margin kept at KEEP or at what it is, if less (a step that spends all of a margin overshoots on the curvature).
  for (let j = 0; j < m0.length; j++) if (Number.isFinite(m0[j])) rows.push({ a: gradM[j].map((g) => -g), b: Math.max(m0[j] - Math.min(m0[j], KEEP), 0) });
  for (const scale of [1, 0.5, 0.25]) {
    const answer = vertexLp(gradF, withBox(rows, x, h, free, scale * box, lo, hi), d);
    // None, or none better than standing still (by the linearised objective).
    if (!answer || !(answer.value < -1e-12)) return null;
    const delta = answer.x;
    let moved = best.cand;
    for (let k = 0; k < d; k++) moved = withCoordinate(moved, k, x[k] + delta[k]);
    const e = evaluate(moved);
    if (e && better(e, best)) return e;
  }
  return null;
}

/** The rows with the box added: each coordinate within `box` of its steps and its limits (frozen ones fixed). */
function withBox(
  rows: readonly LpRow[], x: readonly number[], h: readonly number[], free: readonly boolean[],
  box: number, lo: readonly number[], hi: readonly number[],
): LpRow[] {
  const d = x.length;
  const ups: number[] = [];
  const downs: number[] = [];
  for (let k = 0; k < d; k++) {
    const r = free[k] ? box * h[k] : 0;
    ups.push(Math.max(Math.min(r, hi[k] - x[k]), 0));
    downs.push(Math.max(Math.min(r, x[k] - lo[k]), 0));
  }
  // A row that holds everywhere in the box cannot bind (the vertex search grows with the rows): only the others.
  const out = rows.filter((r) => {
    let most = 0;
    for (let k = 0; k < d; k++) most += Math.max(r.a[k] * ups[k], -r.a[k] * downs[k]);
    return most > r.b;
  });
  for (let k = 0; k < d; k++) {
    const up = new Float64Array(d);
    up[k] = 1;
    out.push({ a: up, b: ups[k] });
    const down = new Float64Array(d);
    down[k] = -1;
    out.push({ a: down, b: downs[k] });
  }
  return out;
}

function withCoordinate(c: Candidate, k: number, v: number): Candidate {
  const n = c.gmid.length;
  const gmid = [...c.gmid];
  const setpoints = [...c.setpoints];
  // Setpoints on a µV grid, gm/ID to 1e-9: the same point reached twice has one key.
  if (k < n) gmid[k] = Math.round(v * 1e9) / 1e9;
  else setpoints[k - n] = Math.round(v * 1e6) / 1e6;
  return { topology: c.topology, l: c.l, gmid, setpoints };
}

function objectiveOf(e: Evaluated, objective: SolveContext['spec']['objective']): number {
  if (objective === 'area') return Math.log(e.area);
  if (objective === 'headroom') return e.nominal.headroom / VOLT_SCALE;
  return -Math.log(e.nominal.rout);
}

function marginList(m: Margins): number[] {
  return [m.rout, m.headroom, m.iout, m.mismatch, m.saturation, m.width];
}

function usable(e: Evaluated | null, m0: readonly number[]): boolean {
  if (!e) return false;
  const m = marginList(e.margins);
  for (let j = 0; j < m0.length; j++) if (Number.isFinite(m0[j]) && !Number.isFinite(m[j])) return false;
  return Number.isFinite(e.area) && Number.isFinite(e.nominal.headroom) && e.nominal.rout > 0;
}
