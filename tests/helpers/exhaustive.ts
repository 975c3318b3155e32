/**
 * Exhaustive reference search for the sizing tests: slow and simple, sharing none of the tool's search.
 *
 * Every design on a grid — each device's length and gm/ID chosen independently, and every VDS setpoint — is
 * sized and judged exactly with the stack layer (src/stack) by the README's definitions:
 * - sizing: each device at its design bias at mid-span v_mid = (headroom + span)/2, VGS from gm/ID, W = I/jd;
 * - minimum width: every output device W ≥ the kit's shortest table length; bias diodes (same L, bias current)
 *   may take a longer table length to reach it, and the design is not realisable when none does;
 * - width limit: every output device W ≤ the spec's wmax, else the README's kit default of 64 fingers of
 *   100 × the shortest table length;
 * - saturation: every device below the top one has VDS ≥ VDSsat (EKV interpolation) at mid-span;
 * - mismatch: Pelgrom σ of the bottom device (Pelgrom, Duinmaijer & Welbers, IEEE JSSC 1989);
 * - headroom: the lowest v such that for every v' up to span Rout(v') ≥ rout and the current stays within 1 % of
 *   its mid-span value, scanned on a fixed 10 mV grid from the span down and bisected to 1 mV;
 * - Rout: the lowest Rout over [max(headroom, target headroom), span] (the exact point plus the grid above).
 *
 * To stay affordable the reference skips a design only on exact necessary conditions (a design whose headroom is
 * below H must meet the targets at every grid point above H; the lowest Rout over an interval is at most the Rout
 * at any point of it; designs are tried in order of area when area is asked), never on estimates: over its grid it
 * returns the true optimum of each question. A coarse grid is searched in full, then a fine grid around the best
 * coarse designs of each question.
 */
import type { LengthSlice } from '../../src/device/types.js';
import type { KitAccess } from '../../src/solve/kit.js';
import type { StackSpec, Topology } from '../../src/design/types.js';
import { topologyOf } from '../../src/topology/index.js';
import {
  biasDevices,
  saturationVoltage,
  sampleAt,
  thermalVoltage,
  vgsForGmid,
  type CurveSample,
  type StackDevice,
  type StackOp,
} from '../../src/stack/index.js';

/** The grid of the reference search. */
export interface Grid {
  /** gm/ID step of the coarse grid, 1/V (each of three local rounds halves it). */
  gmidStep: number;
  /** Setpoint step of the coarse grid, V (each local round halves it). */
  vStep: number;
  /** Lowest and highest gm/ID tried, 1/V (default: the spec's range, else 3..30). */
  gmid?: [number, number];
  /** Runner-up coarse designs per question whose neighbourhood is searched finely too (default 2). */
  keep?: number;
  /** Also answer the nearest-point questions (default true). */
  nearest?: boolean;
  /**
   * Judge only these designs (sized and judged as the grid's are), no grid: a design another search claims is
   * counted only when it is one the reference would allow (lengths and gm/ID in range, every per-device rule).
   */
  only?: Array<{ l: number[]; gmid: number[]; setpoints: number[] }>;
}

/** One design of the reference, judged exactly. */
export interface RefDesign {
  l: number[];
  gmid: number[];
  setpoints: number[];
  w: number[];
  area: number;
  sigma?: number;
  headroom: number;
  /** Lowest Rout over [target headroom, span], Ω. */
  routAtTarget: number;
  /** Lowest Rout over [max(headroom, target headroom), span], Ω (0 for a design never meeting the Rout target). */
  rout: number;
}

/** The answers of the reference search. */
export interface RefAnswer {
  /** Best design meeting every target, by the spec's objective (undefined when none). */
  best?: RefDesign;
  /** Lowest headroom at which the Rout target is met by any design within the mismatch budget, V (Infinity: never up to span). */
  headroomAtRout: number;
  /** Highest lowest-Rout over [target headroom, span] of any design within the mismatch budget, Ω. */
  routAtHeadroom: number;
  /** The designs giving headroomAtRout and routAtHeadroom (when the nearest points were asked for and one exists). */
  headroomDesign?: RefDesign;
  routDesign?: RefDesign;
  /** Designs on the grids (after the per-device rules) and the DC solves spent judging them. */
  designs: number;
  solves: number;
}

interface Option {
  l: number;
  gmid: number;
  slice: LengthSlice;
  vgs: number;
  w: number;
  area: number;
  sigma: number;
}

interface Design {
  opts: Option[];
  setpoints: number[];
  nodes: number[];
  area: number;
  sigma: number;
  devices?: StackDevice[];
  gates?: number[];
  samples?: Map<number, CurveSample>;
  headroom?: number;
  routAt?: Map<number, number>;
  bias?: boolean;
}

const GRID_V = 0.01;
const RESOLUTION = 1e-3;

/** Exhaustive reference for one stack spec and one topology on one corner. */
export function exhaustive(spec: StackSpec, kit: KitAccess, topology: Topology, corner: string, grid: Grid): RefAnswer {
  const nearest = grid.nearest ?? true;
  const table = Array.from(kit.lengths(corner, spec.device));
  const wmin = table[0];
  const lengths = lengthsOf(spec, table);
  const wmax = spec.wmax ?? 64 * 100 * wmin;
  const slices = new Map<number, LengthSlice>();
  const slice = (l: number) => {
    let s = slices.get(l);
    if (!s) slices.set(l, (s = kit.slice(corner, spec.device, l)));
    return s;
  };
  const ut = thermalVoltage(kit.temperature?.(corner, spec.device) ?? 27);
  const coeff = kit.mismatch(spec.device);
  const vmid = 0.5 * (spec.headroom + spec.span);
  const n = Math.ceil(spec.span / GRID_V - 1e-9);
  const vAt = (j: number) => (spec.span * j) / n;
  // Allowed gm/ID: the spec's range, else 3 /V up to 99 % of the highest gm/ID the table reaches (at VSB = 0 and
  // VDS = v_mid/2, scanned over VGS on every allowed length), at most 30 /V — the README's definition.
  const reach = 0.99 * Math.max(...lengths.map((l) => ceiling(slice(l), 0.5 * vmid)));
  const [gLo, gHi] = grid.gmid ?? [spec.gmid?.min ?? 3, Math.min(spec.gmid?.max ?? 30, reach, 30)];
  const devs = topology === 'single' ? 1 : topology === 'triple' ? 3 : 2;
  let solves = 0;

  // ---- per-device options: sized at their design bias, with the rules that concern one device only ----
  const optMemo = new Map<string, Option | null>();
  function option(l: number, gmid: number, vds: number | 'diode', vsb: number, lower: boolean): Option | null {
    const key = `${l}|${gmid}|${vds}|${vsb}|${lower}`;
    const hit = optMemo.get(key);
    if (hit !== undefined) return hit;
    let o: Option | null = null;
    const s = slice(l);
    const vgs = vgsForGmid(s, gmid, vds, vsb);
    if (vgs !== null) {
      const d = vds === 'diode' ? vgs : vds;
      const jd = s.jd(vgs, d, vsb);
      const w = spec.current / jd;
      const saturated = !lower || d >= saturationVoltage(s, gmid, vsb, ut);
      if (jd > 0 && w >= wmin * (1 - 1e-9) && w <= wmax && saturated) {
        // Pelgrom's law: σ² = ((gm/ID)²·A_VT² + A_β²)/(W·L).
        const sigma = coeff ? Math.sqrt((gmid * gmid * coeff.avt * coeff.avt + coeff.abeta * coeff.abeta) / (w * l)) : 0;
        o = { l, gmid, slice: s, vgs, w, area: w * l, sigma };
      }
    }
    optMemo.set(key, o);
    return o;
  }

  /**
   * The gm/ID at which a device reaches the width limit (W rises with gm/ID), when that lies inside the range:
   * the best designs for Rout and headroom often sit on it, between grid points.
   */
  const edgeMemo = new Map<string, number | null>();
  function widthEdge(l: number, vds: number | 'diode', vsb: number): number | null {
    const key = `${l}|${vds}|${vsb}`;
    const hit = edgeMemo.get(key);
    if (hit !== undefined) return hit;
    const s = slice(l);
    const width = (g: number) => {
      const vgs = vgsForGmid(s, g, vds, vsb);
      return vgs === null ? Infinity : spec.current / s.jd(vgs, vds === 'diode' ? vgs : vds, vsb);
    };
    let edge: number | null = null;
    if (width(gHi) > wmax && width(gLo) < wmax) {
      let lo = gLo;
      let hi = gHi;
      for (let it = 0; it < 30; it++) {
        const m = 0.5 * (lo + hi);
        if (width(m) <= wmax) lo = m;
        else hi = m;
      }
      edge = lo;
    }
    edgeMemo.set(key, edge);
    return edge;
  }

  // ---- designs: every combination of options and setpoints (with `edges`, also each device's width edge) ----
  function designsOf(ls: number[][], gs: number[][], sps: number[][], edges = false): Design[] {
    const gmidsAt = (k: number, l: number, vds: number | 'diode', vsb: number) => {
      const e = edges ? widthEdge(l, vds, vsb) : null;
      return e === null ? gs[k] : [...gs[k], e];
    };
    const out: Design[] = [];
    if (topology === 'cascode-stacked') {
      // The bottom diode sets x1 = VGS1: the top device's options depend on each bottom option.
      for (const l1 of ls[0]) for (const g1 of gmidsAt(0, l1, 'diode', 0)) {
        const b = option(l1, g1, 'diode', 0, true);
        if (!b || !(b.vgs < vmid)) continue;
        for (const l2 of ls[1]) for (const g2 of gmidsAt(1, l2, vmid - b.vgs, b.vgs)) {
          const t = option(l2, g2, vmid - b.vgs, b.vgs, false);
          if (t) out.push(make([b, t], [], [0, b.vgs, vmid]));
        }
      }
      return out;
    }
    for (const sp of sps) {
      const nodes = [0];
      const per: Option[][] = [];
      for (let k = 0; k < devs; k++) {
        const lower = k < devs - 1;
        const vds = lower ? sp[k] : vmid - nodes[k];
        const list: Option[] = [];
        if (vds > 0) for (const l of ls[k]) for (const g of gmidsAt(k, l, vds, nodes[k])) {
          const o = option(l, g, vds, nodes[k], lower);
          if (o) list.push(o);
        }
        per.push(list);
        nodes.push(nodes[k] + vds);
      }
      const chosen: Option[] = [];
      const walk = (k: number): void => {
        if (k === devs) {
          out.push(make([...chosen], sp, nodes));
          return;
        }
        for (const o of per[k]) {
          chosen.push(o);
          walk(k + 1);
          chosen.pop();
        }
      };
      walk(0);
    }
    return out;
  }

  function make(opts: Option[], setpoints: number[], nodes: number[]): Design {
    return { opts, setpoints, nodes: [...nodes], area: opts.reduce((a, o) => a + o.area, 0), sigma: opts[0].sigma };
  }

  function build(d: Design): { devices: StackDevice[]; gates: number[] } {
    if (!d.devices) {
      d.devices = d.opts.map((o) => ({ slice: o.slice, w: o.w }));
      d.gates = d.opts.map((o, k) => o.vgs + d.nodes[k]);
    }
    return { devices: d.devices, gates: d.gates! };
  }

  // The design current flows at mid-span by construction: the continuation starts there.
  const midGuess = (d: Design): StackOp => ({ v: vmid, i: spec.current, nodes: d.nodes, devices: [] });

  function sample(d: Design, j: number): CurveSample {
    d.samples ??= new Map();
    let s = d.samples.get(j);
    if (!s) {
      const { devices, gates } = build(d);
      let guess: StackOp = midGuess(d);
      for (let k = j + 1; k <= n; k++) {
        const g = d.samples.get(k)?.op;
        if (g) {
          guess = g;
          break;
        }
      }
      solves++;
      s = sampleAt(devices, gates, vAt(j), guess);
      d.samples.set(j, s);
    }
    return s;
  }

  // README: Rout ≥ target and the current within 1 % of its mid-span value (the design current by construction).
  const ok = (s: CurveSample) => s.op !== null && s.rout >= spec.rout && Math.abs(s.i - spec.current) <= 0.01 * spec.current;
  /** Smallest grid index at or above v. */
  const above = (v: number) => Math.min(n, Math.max(0, Math.ceil(v / (spec.span / n) - 1e-9)));

  function headroomOf(d: Design): number {
    if (d.headroom !== undefined) return d.headroom;
    if (!ok(sample(d, n))) return (d.headroom = Infinity);
    let j = n;
    while (j > 0 && ok(sample(d, j - 1))) j--;
    if (j === 0) return (d.headroom = 0);
    const { devices, gates } = build(d);
    let lo = vAt(j - 1);
    let hi = vAt(j);
    let guess = sample(d, j).op!;
    while (hi - lo > RESOLUTION) {
      const m = 0.5 * (lo + hi);
      solves++;
      const s = sampleAt(devices, gates, m, guess);
      if (ok(s)) {
        hi = m;
        guess = s.op!;
      } else lo = m;
    }
    return (d.headroom = hi);
  }

  /** Rout at exactly v (0 where the table cannot cover it). */
  function routExact(d: Design, v: number): number {
    d.routAt ??= new Map();
    let r = d.routAt.get(v);
    if (r === undefined) {
      const { devices, gates } = build(d);
      solves++;
      const s = sampleAt(devices, gates, v, sample(d, above(v)).op ?? midGuess(d));
      r = s.op && Number.isFinite(s.rout) ? s.rout : 0;
      d.routAt.set(v, r);
    }
    return r;
  }

  /** Lowest Rout over [lo, span]: the exact point plus every grid point above. */
  function minRout(d: Design, lo: number): number {
    let r = routExact(d, lo);
    for (let j = n; j >= 0 && vAt(j) >= lo; j--) {
      const s = sample(d, j);
      r = Math.min(r, s.op ? s.rout : 0);
    }
    return r;
  }

  function biasOk(d: Design): boolean {
    if (d.bias === undefined) {
      const { gates } = build(d);
      try {
        d.bias = biasDevices(topologyOf(topology), d.opts.map((o) => o.slice), gates, spec.biasCurrent ?? spec.current, { wmin, lengths, slice }) !== null;
      } catch {
        d.bias = false;
      }
    }
    return d.bias;
  }

  const sigmaOk = (d: Design) => spec.mismatch === undefined || !coeff || d.sigma <= spec.mismatch;
  const tIdx = above(spec.headroom);

  // ---- the questions, each answered exactly over a list of designs ----
  function feasible(d: Design): boolean {
    if (!sigmaOk(d) || !ok(sample(d, n)) || !ok(sample(d, tIdx))) return false;
    return headroomOf(d) <= spec.headroom && minRout(d, spec.headroom) >= spec.rout && biasOk(d);
  }

  function bestArea(list: Design[]): Design | undefined {
    return [...list].sort((a, b) => a.area - b.area).find(feasible);
  }

  /** Lowest headroom (among designs meeting every target when `capped`); ties go to the smaller area. */
  function lowestHeadroom(list: Design[], capped: boolean): Design | undefined {
    let best: Design | undefined;
    let h = capped ? spec.headroom : Infinity;
    // Likely winners first, so the bound prunes early.
    const sorted = [...list].sort((a, b) => sum(a.setpoints) - sum(b.setpoints) || a.area - b.area);
    for (const d of sorted) {
      if (!sigmaOk(d) || !ok(sample(d, n))) continue;
      // A headroom at or below h needs the targets met at every grid point at or above h.
      if (Number.isFinite(h) && !ok(sample(d, above(h)))) continue;
      const x = headroomOf(d);
      if (!(x < h || (x === h && (best === undefined || d.area < best.area)))) continue;
      if (capped && minRout(d, spec.headroom) < spec.rout) continue;
      if (!biasOk(d)) continue;
      best = d;
      h = x;
    }
    return best;
  }

  /** Highest lowest-Rout over [target headroom, span] (among designs meeting every target when `capped`). */
  function highestRout(list: Design[], capped: boolean): { d?: Design; r: number } {
    // The lowest Rout over [target, span] is at most the Rout at span and at the target.
    const atSpan = (d: Design) => (sample(d, n).op ? sample(d, n).rout : 0);
    const cands = list.filter(sigmaOk).map((d) => ({ d, b: atSpan(d) })).sort((a, b) => b.b - a.b);
    let best: Design | undefined;
    let r = capped ? spec.rout * (1 - 1e-12) : 0;
    for (const { d, b } of cands) {
      if (b <= r) break;
      if (routExact(d, spec.headroom) <= r) continue;
      if (capped && headroomOf(d) > spec.headroom) continue;
      const x = minRout(d, spec.headroom);
      if (x > r && biasOk(d)) {
        best = d;
        r = x;
      }
    }
    return { d: best, r: best ? r : 0 };
  }

  function answer(list: Design[]) {
    const best = spec.objective === 'area' ? bestArea(list)
      : spec.objective === 'headroom' ? lowestHeadroom(list, true)
      : highestRout(list, true).d;
    const hr = nearest ? lowestHeadroom(list, false) : undefined;
    const ro = nearest ? highestRout(list, false) : { d: undefined, r: 0 };
    return { best, hr, ro };
  }

  // ---- coarse grid in full, then fine grids around the best coarse designs ----
  const coarseG = range(gLo, gHi, grid.gmidStep);
  if (coarseG[coarseG.length - 1] < gHi - 1e-9) coarseG.push(gHi);
  const spGrid = (step: number): number[][] => {
    const vs = range(0.05, vmid - 0.05, step);
    if (topology === 'cascode') return vs.map((s) => [s]);
    if (topology === 'triple') return vs.flatMap((a) => vs.filter((b) => a + b <= vmid - 0.05 + 1e-9).map((b) => [a, b]));
    return [[]];
  };
  const all = (x: number[]) => Array.from({ length: devs }, () => x);
  const allowed = (o: { l: number[]; gmid: number[] }) =>
    o.l.every((l) => lengths.some((x) => Math.abs(x - l) <= 1e-9 * l)) && o.gmid.every((g) => g >= gLo - 1e-9 && g <= gHi + 1e-9);
  const coarse = grid.only
    ? grid.only.filter(allowed).flatMap((o) => designsOf(o.l.map((l) => [l]), o.gmid.map((g) => [g]), [o.setpoints]))
    : designsOf(all(lengths), all(coarseG), spGrid(grid.vStep), true);
  const first = answer(coarse);

  const obj = spec.objective;
  const beats = (x: Design, y: Design) =>
    obj === 'area' ? x.area < y.area : obj === 'headroom' ? headroomOf(x) < headroomOf(y) : minRout(x, spec.headroom) > minRout(y, spec.headroom);
  const h = (d?: Design) => (d ? headroomOf(d) : Infinity);
  let best = first.best;
  let hrBest = h(first.hr);
  let hrDesign = first.hr;
  let roBest = first.ro.r;
  let roDesign = first.ro.d;

  // Runners-up seed too: the coarse optimum can sit in another basin than the fine one.
  const keep = grid.keep ?? 2;
  const judged = coarse.filter((d) => d.headroom !== undefined && Number.isFinite(d.headroom));
  let seeds = grid.only ? [] : [first.best, first.hr, first.ro.d,
    ...[...judged].sort((a, b) => a.headroom! - b.headroom!).slice(0, keep),
    ...judged.filter((d) => d.headroom! <= spec.headroom && sigmaOk(d)).sort((a, b) => a.area - b.area).slice(0, keep),
  ].filter((d): d is Design => d !== undefined);
  // Three rounds of local grids, each halving the steps around the previous round's answers.
  let gStep = grid.gmidStep;
  let vStep = grid.vStep;
  const count = { designs: coarse.length };
  for (let round = 0; round < 3 && seeds.length > 0; round++) {
    const fine: Design[] = [];
    const done = new Set<string>();
    for (const d of seeds) {
      const key = `${d.opts.map((o) => `${o.l}/${o.gmid}`).join(',')}|${d.setpoints.join(',')}`;
      if (done.has(key)) continue;
      done.add(key);
      const ls = d.opts.map((o) => neighbours(lengths, o.l, round === 0 ? 1 : 0));
      const gs = d.opts.map((o) => range(Math.max(gLo, o.gmid - gStep), Math.min(gHi, o.gmid + gStep), gStep / 2));
      const sps = cartesian(d.setpoints.map((x) => range(Math.max(0.02, x - vStep), x + vStep, vStep / 2))).filter((sp) => sum(sp) <= vmid - 0.02);
      fine.push(...designsOf(ls, gs, sps));
    }
    count.designs += fine.length;
    const next = answer(fine);
    if (next.best && (!best || beats(next.best, best))) best = next.best;
    if (h(next.hr) < hrBest) [hrBest, hrDesign] = [h(next.hr), next.hr];
    if (next.ro.r > roBest) [roBest, roDesign] = [next.ro.r, next.ro.d];
    seeds = [next.best, next.hr, next.ro.d].filter((d): d is Design => d !== undefined);
    gStep /= 2;
    vStep /= 2;
  }

  const report = (d: Design | undefined): RefDesign | undefined => d && {
    l: d.opts.map((o) => o.l), gmid: d.opts.map((o) => o.gmid), setpoints: d.setpoints, w: d.opts.map((o) => o.w),
    area: d.area, sigma: coeff ? d.sigma : undefined,
    headroom: headroomOf(d), routAtTarget: minRout(d, spec.headroom),
    rout: Number.isFinite(headroomOf(d)) ? minRout(d, Math.max(headroomOf(d), spec.headroom)) : 0,
  };
  return {
    best: report(best),
    headroomAtRout: hrBest,
    routAtHeadroom: roBest,
    headroomDesign: report(hrDesign),
    routDesign: report(roDesign),
    designs: count.designs,
    solves,
  };
}

/** Highest gm/ID over a fine VGS scan at one VDS and VSB = 0. */
function ceiling(s: LengthSlice, vds: number): number {
  let best = 0;
  const [lo, hi] = s.range.vgs;
  for (let j = 0; j <= 400; j++) {
    const r = s.small(lo + ((hi - lo) * j) / 400, vds, 0);
    if (r[0] > 0 && r[1] / r[0] > best) best = r[1] / r[0];
  }
  return best;
}

function range(lo: number, hi: number, step: number): number[] {
  const out: number[] = [];
  for (let j = 0; lo + j * step <= hi + 1e-9; j++) out.push(Math.round((lo + j * step) * 1e6) / 1e6);
  return out;
}

function sum(x: readonly number[]): number {
  return x.reduce((a, b) => a + b, 0);
}

function cartesian(lists: number[][]): number[][] {
  return lists.reduce<number[][]>((acc, xs) => acc.flatMap((a) => xs.map((x) => [...a, x])), [[]]);
}

function neighbours(lengths: number[], l: number, reach: number): number[] {
  const j = lengths.indexOf(l);
  return lengths.slice(Math.max(0, j - reach), j + reach + 1);
}

/** The table lengths the spec allows (or its stepped grid), as the README defines the length range. */
function lengthsOf(spec: StackSpec, table: number[]): number[] {
  const lo = Math.max(spec.l?.min ?? table[0], table[0]);
  const hi = Math.min(spec.l?.max ?? table[table.length - 1], table[table.length - 1]);
  if (spec.l?.step) return range(lo, hi, spec.l.step).map((x) => x);
  return table.filter((l) => l >= lo * (1 - 1e-9) && l <= hi * (1 + 1e-9));
}
