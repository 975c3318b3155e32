import type { Topology } from '../spec/types.js';
import type { Candidate } from './candidate.js';
import { candidateKey } from './candidate.js';
import type { SolveContext } from './context.js';
import { setpointGrid } from './grid.js';
import { prune, stageOptions, type StageOption, type SweepCache } from './options.js';
import { TopK } from './topk.js';

// Lowest top-device VDS used for the Rout-at-headroom estimate; below it the device is off the knee anyway.
const VDS_FLOOR = 0.03;

/**
 * Keeps the few hundred most promising combinations by several measures, so
 * infeasible specs still get near points: by the objective among those
 * meeting the targets by estimate (also with 2× Rout margin), by area, by
 * headroom at the Rout target, by Rout at the headroom target, and by
 * violation. Written flat because it runs for every combination.
 */
class Pools {
  private obj = new TopK<Candidate>(40);
  private margin = new TopK<Candidate>(15);
  private area = new TopK<Candidate>(10);
  private hr = new TopK<Candidate>(12);
  private ro = new TopK<Candidate>(12);
  private viol = new TopK<Candidate>(12);
  private rout: number;
  private objective: SolveContext['spec']['objective'];
  private headroom: number;
  private mismatch: number;
  constructor(private ctx: SolveContext) {
    this.rout = ctx.spec.rout;
    this.objective = ctx.spec.objective;
    this.headroom = ctx.spec.headroom;
    this.mismatch = ctx.spec.mismatch ?? Infinity;
  }

  private keys = new Float64Array(6);
  private heaps = [this.obj, this.margin, this.area, this.hr, this.ro, this.viol];

  /** Rate one combination; true when some pool would keep it (then call keep with the candidate). Logs only when needed. */
  wants(area: number, rout: number, headroom: number, sigma: number): boolean {
    this.ctx.count.screened++;
    this.ctx.count.rated++;
    return this.rate(area, rout, headroom, sigma);
  }

  /**
   * Could any of `count` combinations bounded by these values (smallest area,
   * largest Rout, their headroom, smallest σ) enter a pool? Every key is monotone
   * in them, so false means the whole group can be skipped without loss.
   */
  mayWant(count: number, area: number, rout: number, headroom: number, sigma: number): boolean {
    this.ctx.count.rated++;
    if (this.rate(area, rout, headroom, sigma)) return true;
    this.ctx.count.screened += count;
    return false;
  }

  private rate(area: number, rout: number, headroom: number, sigma: number): boolean {
    const routOk = rout >= this.rout;
    const hrOk = headroom <= this.headroom;
    const sigOk = sigma <= this.mismatch;
    const k = this.keys;
    const h = this.heaps;
    let any = false;
    if (routOk && hrOk && sigOk) {
      const obj = this.objective === 'area' ? area : this.objective === 'headroom' ? headroom : -Math.log(rout);
      k[0] = obj;
      k[1] = rout >= 2 * this.rout ? obj : Infinity;
      k[2] = area;
      any = h[0].accepts(obj) || h[1].accepts(k[1]) || h[2].accepts(area);
    } else k[0] = k[1] = k[2] = Infinity;
    k[3] = routOk && sigOk ? headroom : Infinity;
    any = h[3].accepts(k[3]) || any;
    k[4] = hrOk && sigOk && rout > this.roFloor() ? -Math.log(rout) : Infinity;
    any = h[4].accepts(k[4]) || any;
    const v = (routOk ? 0 : Math.log(this.rout / rout)) + (hrOk ? 0 : (headroom - this.headroom) / 0.05) + (sigOk ? 0 : 2 * Math.log(sigma / this.mismatch));
    k[5] = v + 1e-6 * area * 1e12;
    return h[5].accepts(k[5]) || any;
  }

  // Rout a combination must beat to enter the Rout pool (avoids a log for the rest).
  private roFloor(): number {
    const w = this.ro.worst();
    if (w !== this.roWorst) {
      this.roWorst = w;
      this.roFloorValue = w === undefined ? 0 : Math.exp(-w);
    }
    return this.roFloorValue;
  }
  private roWorst: number | undefined;
  private roFloorValue = 0;

  /** Store the combination last rated by `wants`. */
  keep(c: Candidate): void {
    for (let j = 0; j < 6; j++) this.heaps[j].push(this.keys[j], c);
  }

  candidates(): Candidate[] {
    const seen = new Set<string>();
    const out: Candidate[] = [];
    for (const h of this.heaps) {
      for (const c of h.sorted()) {
        const k = candidateKey(c);
        if (!seen.has(k)) {
          seen.add(k);
          out.push(c);
        }
      }
    }
    return out;
  }
}

/**
 * The bottom devices one (top, middle) pair could want, found without trying
 * them all: with Rout ≈ a + b·ro_bottom, area adding up and headroom set by the
 * pair, the pools' best bottoms are the smallest-area one reaching the Rout
 * target (and twice it) within the mismatch budget, and the highest-ro one
 * within the budget and overall. Sorted by ro with suffix minima of area, each
 * is a binary search.
 */
class BottomFinder {
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
    let n = 0;
    const add = (o: StageOption | undefined) => {
      if (o && (n < 1 || out[0] !== o) && (n < 2 || out[1] !== o) && (n < 3 || out[2] !== o)) out[n++] = o;
    };
    add(this.atLeast(need));
    add(this.atLeast(need2));
    add(this.maxOk);
    add(this.maxAll);
    return n;
  }
}

// Sweeps depend only on the stack's kit, corner and device: share them across its topologies.
const sweeps = new WeakMap<SolveContext, SweepCache>();
function sweepsOf(ctx: SolveContext): SweepCache {
  let c = sweeps.get(ctx);
  if (!c) sweeps.set(ctx, (c = new Map()));
  return c;
}

/**
 * The coarse triple grid can step over the narrow band where lower devices are just
 * saturated (VDSsat ≥ 4·UT at any inversion, 4.5·UT at 80 % of the gm/ID ceiling by the
 * EKV relations): add that setpoint, on the 25 mV grid, when it lies inside.
 */
function withLowSetpoint(ctx: SolveContext, grid: number[]): number[] {
  const low = Math.ceil((4.5 * ctx.ut(ctx.nominal)) / 0.025 - 1e-9) * 0.025;
  if (grid.length === 0 || low > grid[grid.length - 1] || grid.some((g) => Math.abs(g - low) < 1e-9)) return grid;
  return [...grid, Math.round(low * 1e6) / 1e6].sort((a, b) => a - b);
}

const bottomCrit = (ctx: SolveContext) => (o: StageOption) => (ctx.spec.mismatch === undefined ? [o.area, -o.ro] : [o.area, -o.ro, o.sigma]);
// The stacked bottom's VGS is also its drain voltage, which adds to the headroom.
const diodeCrit = (ctx: SolveContext) => (o: StageOption) => [...bottomCrit(ctx)(o), o.vgs];
const midCrit = (o: StageOption) => [o.area, -o.ro, -o.gmt];
const topCrit = (o: StageOption) => [o.area, -o.ro, -o.gmt, o.vdsat];

/**
 * Screen every combination of the grids with saturation small-signal
 * estimates at nominal bias: Rout ≈ ro_N + (1 + gmt_N·ro_N)·R_below, with the
 * top device taken at the target headroom; headroom ≈ Σ setpoints + the top
 * device's VDSsat. Per-stage options another option beats on every criterion
 * are dropped first (the estimate is monotone in them).
 */
export function screen(ctx: SolveContext, topology: Topology): Candidate[] {
  const pools = new Pools(ctx);
  const cache = sweepsOf(ctx);
  const s = ctx.spec;
  const hrTop = (below: number) => Math.max(s.headroom - below, VDS_FLOOR);
  // The same top-device options recur for every split of the voltage below it.
  const topMemo = new Map<string, StageOption[]>();
  const top = (below: number, gmids = ctx.gmids): StageOption[] => {
    const key = `${below.toFixed(6)}|${gmids.length}`;
    let t = topMemo.get(key);
    if (!t) topMemo.set(key, (t = prune(stageOptions(ctx, cache, { mode: ctx.vmid - below, vsb: below, smallAt: hrTop(below), gmids }), topCrit)));
    return t;
  };

  if (topology === 'single') {
    for (const o of stageOptions(ctx, cache, { mode: ctx.vmid, vsb: 0, smallAt: hrTop(0) })) {
      if (pools.wants(o.area, o.ro, o.vdsat, o.sigma)) pools.keep({ topology, l: [o.l], gmid: [o.gmid], setpoints: [] });
    }
  } else if (topology === 'cascode') {
    for (const s1 of setpointGrid(s, ctx.vmid, 0.025)) {
      const bottom = prune(stageOptions(ctx, cache, { mode: s1, vsb: 0, lower: true }), bottomCrit(ctx));
      if (bottom.length === 0) continue;
      const tops = top(s1);
      for (const t of tops) {
        const a = t.ro;
        const b = 1 + t.gmt * t.ro;
        for (const o of bottom) {
          if (pools.wants(o.area + t.area, a + b * o.ro, s1 + t.vdsat, o.sigma)) pools.keep({ topology, l: [o.l, t.l], gmid: [o.gmid, t.gmid], setpoints: [s1] });
        }
      }
    }
  } else if (topology === 'cascode-stacked') {
    // The bottom diode sets x1 = VGS1; group bottoms by x1 (25 mV) so top options (and their sweeps) are shared.
    const groups = new Map<number, StageOption[]>();
    for (const o of prune(stageOptions(ctx, cache, { mode: 'diode', vsb: 0, lower: true }), diodeCrit(ctx))) {
      const x1 = Math.round(o.vgs * 40) / 40;
      if (!groups.has(x1)) groups.set(x1, []);
      groups.get(x1)!.push(o);
    }
    for (const [x1, bottom] of groups) {
      if (x1 >= ctx.vmid - 0.05) continue;
      for (const t of top(x1)) {
        const a = t.ro;
        const b = 1 + t.gmt * t.ro;
        for (const o of bottom) {
          if (pools.wants(o.area + t.area, a + b * o.ro, o.vgs + t.vdsat, o.sigma)) pools.keep({ topology, l: [o.l, t.l], gmid: [o.gmid, t.gmid], setpoints: [] });
        }
      }
    }
  } else {
    // Three stages multiply: screen on every other gm/ID value and let refinement fill in.
    const grid = withLowSetpoint(ctx, setpointGrid(s, ctx.vmid, 0.05));
    const gm = ctx.gmids.filter((_, j) => j % 2 === 0);
    const bottoms = new Map(grid.map((s1) => [s1, prune(stageOptions(ctx, cache, { mode: s1, vsb: 0, gmids: gm, lower: true }), bottomCrit(ctx))]));
    const picked: StageOption[] = [];
    const finders = new Map([...bottoms].map(([s1, b]) => [s1, new BottomFinder(b, s.mismatch)]));
    for (const s1 of grid) {
      for (const s2 of grid) {
        const below = Math.round((s1 + s2) * 1e6) / 1e6;
        // The top device needs room for its own saturation voltage (≥ 4·UT).
        if (below > Math.max(grid[grid.length - 1] - 0.05, grid[0]) + 1e-9) continue;
        const bottom = bottoms.get(s1)!;
        if (bottom.length === 0) continue;
        const mids = prune(stageOptions(ctx, cache, { mode: s2, vsb: s1, gmids: gm, lower: true }), midCrit);
        if (mids.length === 0) continue;
        const tops = top(below, gm);
        const find = finders.get(s1)!;
        for (const t of tops) {
          const a3 = 1 + t.gmt * t.ro;
          for (const m of mids) {
            // Rout ≈ a + b·ro_bottom: for this (top, middle) pair each pool wants one bottom, found by search
            // in the bottoms sorted by ro, so the work per pair grows with the log of the bottom count.
            const a = t.ro + a3 * m.ro;
            const b = a3 * (1 + m.gmt * m.ro);
            const hr = below + t.vdsat;
            const count = find.picks((s.rout - a) / b, (2 * s.rout - a) / b, picked);
            ctx.count.screened += bottom.length - count;
            for (let j = 0; j < count; j++) {
              const o = picked[j];
              if (pools.wants(o.area + m.area + t.area, a + b * o.ro, hr, o.sigma)) pools.keep({ topology, l: [o.l, m.l, t.l], gmid: [o.gmid, m.gmid, t.gmid], setpoints: [s1, s2] });
            }
          }
        }
      }
    }
  }
  return pools.candidates();
}
