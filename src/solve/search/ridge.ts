import { coordinates, type Candidate } from './candidate.js';
import type { SolveContext } from '../context.js';
import { VOLT_SCALE, type Margins } from '../../policy.js';
import type { Evaluated } from '../evaluate/evaluate.js';
import { boxLp1, vertexLp, type LpRow } from '../../numeric/index.js';

// Margin (in the policy's units: 50 mV, ln Rout, …) a ridge step keeps where the design has it.
const KEEP = 0.02;

/** The objective's and the margins' slopes along one coordinate, to one side (null: not measurable there). */
interface Slope {
  f: number;
  m: Float64Array;
}

/** A ridge step taken: the design it reached and the box (in steps) of the try that reached it. */
export interface RidgeMove<T> {
  next: T;
  box: number;
}

/**
 * One step along a ridge of the design space, for a climb stuck where several targets bind at once: no move of one or
 * two coordinates by the climb's steps keeps every target met and improves the objective, though a move of three or
 * more in the right proportions would (e.g. a bottom gm/ID raised, its setpoint lowered and the top's gm/ID lowered,
 * each by its own amount). See ridgeStepOver; here over a stack candidate's continuous coordinates (gm/ID per device,
 * setpoints). `lo`, `hi`: limits of each coordinate.
 */
export function ridgeStep(
  best: Evaluated, h: readonly number[], box: number, least: number, lo: readonly number[], hi: readonly number[],
  evaluate: (c: Candidate) => Evaluated | null, better: (a: Evaluated, b: Evaluated) => boolean, objective: SolveContext['spec']['objective'],
): RidgeMove<Evaluated> | null {
  const m0 = marginList(best.margins);
  const pointOf = (e: Evaluated | null): RidgePoint<Evaluated> | null =>
    usable(e, m0) ? { design: e!, f: objectiveOf(e!, objective), m: marginList(e!.margins) } : null;
  const at = (x: ArrayLike<number>, moved: readonly number[]) => pointOf(evaluate(moved.reduce((c, k) => withCoordinate(c, k, x[k]), best.cand)));
  return ridgeStepOver({ design: best, f: objectiveOf(best, objective), m: m0 }, coordinates(best.cand), h, box, least, lo, hi, at, better);
}

/** Objective (lower is better) and margins (≥ 0 met; not finite: not a target) of a design, for ridgeStepOver. */
export interface RidgeFigures {
  f: number;
  m: readonly number[];
}

/** A design with its figures. */
export interface RidgePoint<T> extends RidgeFigures {
  design: T;
}

/** The figures (or the design) with the coordinates `moved` set to `x`'s, the others as the step's start; null: not measurable. */
type RidgeAt<P> = (x: ArrayLike<number>, moved: readonly number[]) => P | null;

/**
 * One ridge step from `best` at coordinates `x`: from differences of the objective and the margins in each
 * coordinate, the linearised problem (objective down, every margin kept ≥ 0, each coordinate within `box` steps `h`)
 * is solved as a small linear programme, and its answer tried; on failure again within half the box, and so on down
 * to `least` steps (sequential linear programming with a trust region, common practice; a caller may grow the box
 * while whole-box steps succeed). Returns the first try `better` prefers to `best`, with its box, or null. `lo`, `hi`: limits of each coordinate; `at`: the design there, null when it cannot be realised or
 * leaves a margin of `best` undefined; `slopesAt`: the figures the differences are taken of (`at`'s, unless the
 * caller has a cheaper estimate, exact to first order); `corrections`: how often a try that lost a margin is
 * corrected before the box is halved (see `tries`).
 *
 * The differences are one-sided (forward where it can be realised), and a margin can have a kink where the design
 * stands (the headroom is least at some setpoint and rises on both sides of it). When no try is better and an answer
 * moved a coordinate the other way, the slopes that side are measured too, and the tries are made again with the
 * programme solved for each side of each coordinate measured both ways, on that side's slopes (a piecewise linear
 * model, exact on either side of the kink).
 */
export function ridgeStepOver<T>(
  best: RidgePoint<T>, x: readonly number[], h: readonly number[], box: number, least: number, lo: readonly number[], hi: readonly number[],
  at: RidgeAt<RidgePoint<T>>, better: (a: T, b: T) => boolean, slopesAt: RidgeAt<RidgeFigures> = at, corrections = 0,
): RidgeMove<T> | null {
  const d = x.length;
  const { f: f0, m: m0 } = best;
  // Slopes up (+1) and down (−1) per coordinate; undefined until measured.
  const up: (Slope | null | undefined)[] = new Array(d);
  const down: (Slope | null | undefined)[] = new Array(d);
  const measure = (k: number, dir: 1 | -1): Slope | null => {
    const dk = dir * h[k];
    const v = x[k] + dk;
    const e = v <= hi[k] && v >= lo[k] ? slopesAt(x.map((xj, j) => (j === k ? v : xj)), [k]) : null;
    if (!e) return null;
    return { f: (e.f - f0) / dk, m: Float64Array.from(m0, (v0, j) => (e.m[j] - v0) / dk) };
  };
  // Forward, else backward where the forward point cannot be realised (or leaves a margin undefined).
  for (let k = 0; k < d; k++) if (!(up[k] = measure(k, 1))) down[k] = measure(k, -1);
  // Whether an answer moved a coordinate to a side not measured.
  let against = false;
  // The answer within `r` steps; when it moves a coordinate to a side not measured, with `sides` that side is
  // measured and the programme solved again.
  const answerWithin = (r: number, sides: boolean, shift: readonly number[]) => {
    let answer = bestOverSides(x, h, r, lo, hi, m0, up, down, shift);
    for (;;) {
      const unmeasured = answer ? unmeasuredSides(answer.x, up, down) : [];
      if (unmeasured.length > 0) against = true;
      if (unmeasured.length === 0 || !sides) return answer;
      for (const [k, dir] of unmeasured) (dir > 0 ? up : down)[k] = measure(k, dir);
      answer = bestOverSides(x, h, r, lo, hi, m0, up, down, shift);
    }
  };
  const all = x.map((_, k) => k);
  const none = m0.map(() => 0);
  const tries = (sides: boolean): RidgeMove<T> | null => {
    for (let r = box; r >= least; r /= 2) {
      const answer = answerWithin(r, sides, none);
      // None, or none better than standing still (by the linearised objective).
      if (!answer || !(answer.value < -1e-12)) return null;
      const e = at(x.map((xk, k) => xk + answer.x[k]), all);
      if (e && better(e.design, best.design)) return { next: e.design, box: r };
      // A try that lost a margin the programme kept (curvature, where a margin is thin): again within this box with
      // each such margin's row tightened by what the try fell short of its floor (a second-order correction), at most
      // `corrections` times; a margin resolved only so finely (a swing edge on a trace grid) can stay a hair short of
      // it, so each further shortfall counts twice as much as the one before.
      const shift = m0.map(() => 0);
      for (let i = 0, t = e; t && i < corrections; i++) {
        const m = t.m;
        const short = m0.map((v, j) => (Number.isFinite(v) && m[j] < 0 ? v - kept(v) - m[j] : 0));
        if (!short.some((v) => v > 0)) break;
        for (const [j, v] of short.entries()) shift[j] += v * 2 ** i;
        const again = answerWithin(r, sides, shift);
        if (!again || !(again.value < -1e-12)) break;
        t = at(x.map((xk, k) => xk + again.x[k]), all);
        if (t && better(t.design, best.design)) return { next: t.design, box: r };
      }
    }
    return null;
  };
  // First on the slopes of one side, extrapolated to the other (no more evaluations, and right where the margins are
  // smooth); when no try was better and an answer went where that extrapolates, again with that side measured.
  return tries(false) ?? (against ? tries(true) : null);
}

/** The coordinates `delta` moves to a side whose slopes are not measured yet, with that side. */
function unmeasuredSides(delta: ArrayLike<number>, up: readonly (Slope | null | undefined)[], down: readonly (Slope | null | undefined)[]): [number, 1 | -1][] {
  const out: [number, 1 | -1][] = [];
  for (let k = 0; k < delta.length; k++) {
    if (delta[k] > 0 && up[k] === undefined) out.push([k, 1]);
    else if (delta[k] < 0 && down[k] === undefined) out.push([k, -1]);
  }
  return out;
}

/**
 * The linearised problem's best answer within `box` steps: a coordinate with slopes one way only moves either way on
 * them; one measured both ways moves one way at a time, on that side's slopes (each combination of sides solved).
 */
function bestOverSides(
  x: readonly number[], h: readonly number[], box: number, lo: readonly number[], hi: readonly number[], m0: readonly number[],
  up: readonly (Slope | null | undefined)[], down: readonly (Slope | null | undefined)[], shift: readonly number[],
): { x: Float64Array; value: number } | null {
  const d = x.length;
  const both: number[] = [];
  for (let k = 0; k < d; k++) if (up[k] && down[k]) both.push(k);
  let best: { x: Float64Array; value: number } | null = null;
  for (let pattern = 0; pattern < 1 << both.length; pattern++) {
    const c = new Float64Array(d);
    const slopes: (Slope | null)[] = [];
    const reach: { up: number; down: number }[] = [];
    for (let k = 0; k < d; k++) {
      const j = both.indexOf(k);
      const side = j >= 0 ? ((pattern >> j) & 1 ? 1 : -1) : 0;
      const s = side > 0 ? up[k]! : side < 0 ? down[k]! : (up[k] ?? down[k] ?? null);
      slopes.push(s);
      c[k] = s?.f ?? 0;
      // Frozen without slopes; one side only when measured both ways, or when the other cannot be realised.
      const r = s ? box * h[k] : 0;
      const upOk = side >= 0 && up[k] !== null;
      const downOk = side <= 0 && down[k] !== null;
      reach.push({ up: upOk ? Math.max(Math.min(r, hi[k] - x[k]), 0) : 0, down: downOk ? Math.max(Math.min(r, x[k] - lo[k]), 0) : 0 });
    }
    const answer = programme(c, marginRows(m0, slopes, shift), reach);
    if (answer && (!best || answer.value < best.value)) best = answer;
  }
  return best;
}

/** The floor a ridge step keeps a margin at: KEEP, or what it is, if less (a step that spends all of a margin overshoots on the curvature). */
function kept(m: number): number {
  return Math.min(m, KEEP);
}

/**
 * Half-spaces a·δ ≤ b: the linearised margins, each kept at its floor (kept), raised by `shift` (per margin).
 * `slopes`: per coordinate (null: frozen).
 */
function marginRows(m0: readonly number[], slopes: readonly (Slope | null)[], shift: readonly number[]): LpRow[] {
  const rows: LpRow[] = [];
  for (let j = 0; j < m0.length; j++) {
    if (!Number.isFinite(m0[j])) continue;
    rows.push({ a: Float64Array.from(slopes, (s) => -(s?.m[j] ?? 0)), b: Math.max(m0[j] - kept(m0[j]), 0) - shift[j] });
  }
  return rows;
}

/**
 * The linearised programme's answer: min c·δ within the margin rows and each coordinate's reach; by boxLp1 when at
 * most one row can bind, else by vertexLp.
 */
function programme(c: Float64Array, rows: readonly LpRow[], reach: readonly { up: number; down: number }[]): { x: Float64Array; value: number } | null {
  const d = reach.length;
  // A row that holds everywhere in the box cannot bind (the vertex search grows with the rows): only the others.
  const binding = rows.filter((r) => {
    let most = 0;
    for (let k = 0; k < d; k++) most += Math.max(r.a[k] * reach[k].up, -r.a[k] * reach[k].down);
    return most > r.b;
  });
  if (binding.length <= 1) {
    const row = binding[0] ?? { a: new Float64Array(d), b: 0 };
    return boxLp1(c, row.a, row.b, reach.map((r) => r.up), reach.map((r) => r.down));
  }
  return vertexLp(c, withBox(binding, reach), d);
}

/** The rows with the box added: each coordinate within its reach up and down. */
function withBox(rows: readonly LpRow[], reach: readonly { up: number; down: number }[]): LpRow[] {
  const d = reach.length;
  const out = [...rows];
  for (let k = 0; k < d; k++) {
    const upRow = new Float64Array(d);
    upRow[k] = 1;
    out.push({ a: upRow, b: reach[k].up });
    const downRow = new Float64Array(d);
    downRow[k] = -1;
    out.push({ a: downRow, b: reach[k].down });
  }
  return out;
}

/** `c` with its continuous coordinate k (see coordinates) set to `v`. */
export function withCoordinate(c: Candidate, k: number, v: number): Candidate {
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
