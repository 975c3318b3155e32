import { topologyOf, type Candidate, type Criteria, type ScreenTools, type StageBias, type StageOption, type Topology } from '../../topology/index.js';
import { CandidateIds } from './candidate-map.js';
import type { SolveContext } from '../context.js';
import { setpointGrid } from './grid.js';
import { prune, stageOptions } from './stage-options.js';
import { TopK } from '../../numeric/topk.js';

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
  private count: SolveContext['count'];
  constructor(ctx: SolveContext) {
    this.count = ctx.count;
    this.rout = ctx.spec.rout;
    this.objective = ctx.spec.objective;
    this.headroom = ctx.spec.headroom;
    this.mismatch = ctx.spec.mismatch ?? Infinity;
  }

  private keys = new Float64Array(6);
  private heaps = [this.obj, this.margin, this.area, this.hr, this.ro, this.viol];

  // Arrow fields: the screen tools hand these out as they are (one call fewer per combination).
  /** Rate one combination; true when some pool would keep it (then call keep with the candidate). Logs only when needed. */
  readonly wants = (area: number, rout: number, headroom: number, sigma: number): boolean => {
    this.count.screened++;
    this.count.rated++;
    return this.rate(area, rout, headroom, sigma);
  };

  /**
   * Could any of `count` combinations bounded by these values (smallest area,
   * largest Rout, their headroom, smallest σ) enter a pool? Every key is monotone
   * in them, so false means the whole group can be skipped without loss.
   */
  readonly mayWant = (count: number, area: number, rout: number, headroom: number, sigma: number): boolean => {
    this.count.rated++;
    if (this.rate(area, rout, headroom, sigma)) return true;
    this.count.screened += count;
    return false;
  };

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
    // A combination kept by several pools is one object: skip those before quantising them.
    const same = new Set<Candidate>();
    const ids = new CandidateIds();
    const out: Candidate[] = [];
    for (const h of this.heaps) {
      for (const c of h.sorted()) {
        if (same.has(c)) continue;
        same.add(c);
        if (ids.fresh(c)) out.push(c);
      }
    }
    return out;
  }
}

// Criteria of each kind, written out (no spread) into prune's table: prune reads them once per option.
function criteria(size: number, into: (o: StageOption, out: Float64Array, at: number) => void): Criteria {
  const row = new Float64Array(size);
  return Object.assign((o: StageOption) => {
    into(o, row, 0);
    return Array.from(row);
  }, { size, into });
}
const bottomCrit = criteria(2, (o, c, j) => {
  c[j] = o.area;
  c[j + 1] = -o.ro;
});
const bottomCritSigma = criteria(3, (o, c, j) => {
  c[j] = o.area;
  c[j + 1] = -o.ro;
  c[j + 2] = o.sigma;
});
// The stacked bottom's VGS is also its drain voltage, which adds to the headroom.
const diodeCrit = criteria(3, (o, c, j) => {
  c[j] = o.area;
  c[j + 1] = -o.ro;
  c[j + 2] = o.vgs;
});
const diodeCritSigma = criteria(4, (o, c, j) => {
  c[j] = o.area;
  c[j + 1] = -o.ro;
  c[j + 2] = o.sigma;
  c[j + 3] = o.vgs;
});
const midCrit = criteria(3, (o, c, j) => {
  c[j] = o.area;
  c[j + 1] = -o.ro;
  c[j + 2] = -o.gmt;
});
const topCrit = criteria(4, (o, c, j) => {
  c[j] = o.area;
  c[j + 1] = -o.ro;
  c[j + 2] = -o.gmt;
  c[j + 3] = o.vdsat;
});

// Pruned lists by the option list they came from (stageOptions hands out the same list for the same ask) and criteria.
const pruned = new WeakMap<readonly StageOption[], Map<Criteria, readonly StageOption[]>>();
function prunedOf(options: readonly StageOption[], crit: Criteria): readonly StageOption[] {
  let byCrit = pruned.get(options);
  if (!byCrit) pruned.set(options, (byCrit = new Map()));
  let out = byCrit.get(crit);
  if (!out) byCrit.set(crit, (out = prune(options, crit)));
  return out;
}

/**
 * Screen every combination the topology enumerates with saturation
 * small-signal estimates at nominal bias: Rout ≈ ro_N + (1 + gmt_N·ro_N)·R_below,
 * with the top device taken at the target headroom; headroom ≈ Σ setpoints +
 * the top device's VDSsat. Per-stage options another option beats on every
 * criterion are dropped first (the estimate is monotone in them).
 */
export function screen(ctx: SolveContext, topology: Topology): Candidate[] {
  const pools = new Pools(ctx);
  const s = ctx.spec;
  const topVds = (below: number) => Math.max(s.headroom - below, VDS_FLOOR);
  const options = (at: StageBias) => stageOptions(ctx, at);
  const sigma = ctx.spec.mismatch !== undefined;
  const crit = { bottom: sigma ? bottomCritSigma : bottomCrit, diode: sigma ? diodeCritSigma : diodeCrit, mid: midCrit, top: topCrit };
  // The same top-device options recur for every split of the voltage below it (by µV of `below`, then grid size).
  const topMemo = new Map<number, Map<number, readonly StageOption[]>>();
  const top = (below: number, gmids: readonly number[] = ctx.gmids): readonly StageOption[] => {
    const key = Math.round(below * 1e6);
    let byGrid = topMemo.get(key);
    if (!byGrid) topMemo.set(key, (byGrid = new Map()));
    let t = byGrid.get(gmids.length);
    if (!t) byGrid.set(gmids.length, (t = prunedOf(options({ mode: ctx.vmid - below, vsb: below, smallAt: topVds(below), gmids }), crit.top)));
    return t;
  };
  const tools: ScreenTools = {
    headroom: s.headroom,
    rout: s.rout,
    mismatch: s.mismatch,
    vmid: ctx.vmid,
    gmids: ctx.gmids,
    ut: ctx.ut(ctx.nominal),
    options,
    prune: prunedOf,
    top,
    topVds,
    setpointGrid: (step) => setpointGrid(s, ctx.vmid, step),
    crit,
    wants: pools.wants,
    mayWant: pools.mayWant,
    keep: (l, gmid, setpoints) => pools.keep({ topology, l, gmid, setpoints }),
    covered: (count) => {
      ctx.count.screened += count;
    },
  };
  topologyOf(topology).screen(tools);
  return pools.candidates();
}
