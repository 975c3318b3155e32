import type { VdsMode } from '../../stack/invert.js';
import type { LengthSlice } from '../../device/types.js';
import { covers, saturationVoltage } from '../../stack/index.js';
import type { SolveContext } from '../context.js';
import { pelgromSigma } from '../evaluate/mismatch.js';
import { atGmid, sweepVgs, type Sweep } from './sweep.js';

import { nonDominated } from '../../numeric/pareto.js';
import type { StageBias, StageOption } from '../../topology/types.js';

export type SweepCache = Map<string, Sweep | null>;

function sweepOf(ctx: SolveContext, l: number, mode: VdsMode, vsb: number): Sweep | null {
  const key = `${l}|${mode}|${vsb.toFixed(4)}`;
  if (!ctx.sweeps.has(key)) ctx.sweeps.set(key, sweepVgs(ctx.slice(ctx.nominal, l), mode, vsb));
  return ctx.sweeps.get(key)!;
}

const buf = new Float64Array(4);

// Per-width gm, gds, gmb at one bias, null outside the table.
function smallThere(slice: LengthSlice, vgs: number, vds: number, vsb: number): { gm: number; gds: number; gmb: number } | null {
  if (!covers(slice, vgs, vds, vsb)) return null;
  const r = slice.small(vgs, vds, vsb, buf);
  return { gm: r[1], gds: r[2], gmb: r[3] };
}

/**
 * Options for one device over the L × gm/ID grid. gm/ID fixes VGS at the
 * design bias (VDS `mode`, `vsb`); W = I / jd. Small-signal values come from
 * the design bias, or from `smallAt` (another VDS at the same VGS) when given.
 * Options narrower than the minimum width, and lower devices below their
 * VDSsat, are left out (the exact evaluation would reject them).
 */
export function stageOptions(ctx: SolveContext, at: StageBias): StageOption[] {
  const { mode, vsb, smallAt } = at;
  const gmids = at.gmids ?? ctx.gmids;
  const out: StageOption[] = [];
  const i = ctx.spec.current;
  const ut = ctx.ut(ctx.nominal);
  const lower = at.lower === true && ctx.saturation === 'require';
  // VDSsat ≥ 4·UT at any inversion level: no lower device fits below that.
  if (lower && typeof mode === 'number' && mode < 4 * ut) return out;
  for (const l of ctx.lengths) {
    const nom = sweepOf(ctx, l, mode, vsb);
    if (!nom) continue;
    const slice = ctx.slice(ctx.nominal, l);
    for (const gmid of gmids) {
      const p = atGmid(nom, gmid);
      if (!p) continue;
      // One lookup per option at the other VDS beats a shared sweep there (fewer options than sweep points).
      const q = smallAt === undefined ? p : smallThere(slice, p.vgs, smallAt, vsb);
      if (!q) continue;
      const w = i / p.jd;
      if (w < ctx.wmin) continue;
      const sat = saturationVoltage(slice, gmid, vsb, ut);
      if (lower && sat > (mode === 'diode' ? p.vgs : mode)) continue;
      out.push({
        l, gmid, w, area: w * l, vgs: p.vgs,
        ro: 1 / (q.gds * w),
        gmt: (q.gm + q.gmb) * w,
        vdsat: Math.max(2 / gmid, 0.1),
        sat,
        sigma: ctx.coeff ? pelgromSigma(gmid, w, l, ctx.coeff) : 0,
      });
    }
  }
  // Options within the width limit when there are any; else all, so the nearest design can show the limit binding.
  const fit = out.filter((o) => o.w <= ctx.wmax);
  return fit.length > 0 ? fit : out;
}

/**
 * Drop options another option beats on every listed criterion (all to be
 * minimised): lossless for a screen whose estimate is monotone in them.
 */
export function prune<T>(items: readonly T[], crit: (t: T) => number[]): T[] {
  return nonDominated(items, crit);
}
