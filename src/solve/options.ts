import type { VdsMode } from '../stack/invert.js';
import type { SolveContext } from './context.js';
import { pelgromSigma } from './mismatch.js';
import { atGmid, atVgs, sweepVgs, type Sweep } from './sweep.js';

/** One device choice in the screen, with its saturation small-signal estimates. */
export interface StageOption {
  l: number;
  gmid: number;
  w: number;
  area: number;
  /** VGS at the design bias, V. */
  vgs: number;
  ro: number;
  /** gm + gmb, S. */
  gmt: number;
  /** Saturation VDS estimate 2/(gm/ID), floored at 4·UT (common practice). */
  vdsat: number;
  sigma: number;
}

export type SweepCache = Map<string, Sweep | null>;

function sweepOf(ctx: SolveContext, cache: SweepCache, l: number, mode: VdsMode, vsb: number): Sweep | null {
  const key = `${l}|${mode}|${vsb.toFixed(4)}`;
  if (!cache.has(key)) cache.set(key, sweepVgs(ctx.slice(ctx.nominal, l), mode, vsb));
  return cache.get(key)!;
}

/**
 * Options for one device over the L × gm/ID grid. gm/ID fixes VGS at the
 * design bias (VDS `mode`, `vsb`); W = I / jd. Small-signal values come from
 * the design bias, or from `smallAt` (another VDS at the same VGS) when given.
 */
export function stageOptions(
  ctx: SolveContext,
  cache: SweepCache,
  mode: VdsMode,
  vsb: number,
  smallAt?: number,
  gmids: readonly number[] = ctx.gmids,
): StageOption[] {
  const out: StageOption[] = [];
  const i = ctx.spec.current;
  for (const l of ctx.lengths) {
    const nom = sweepOf(ctx, cache, l, mode, vsb);
    if (!nom) continue;
    const alt = smallAt === undefined ? null : sweepOf(ctx, cache, l, smallAt, vsb);
    if (smallAt !== undefined && !alt) continue;
    for (const gmid of gmids) {
      const p = atGmid(nom, gmid);
      if (!p) continue;
      const q = alt ? atVgs(alt, p.vgs) : p;
      if (!q) continue;
      const w = i / p.jd;
      out.push({
        l, gmid, w, area: w * l, vgs: p.vgs,
        ro: 1 / (q.gds * w),
        gmt: (q.gm + q.gmb) * w,
        vdsat: Math.max(2 / gmid, 0.1),
        sigma: ctx.coeff ? pelgromSigma(gmid, w, l, ctx.coeff) : 0,
      });
    }
  }
  return out;
}

/**
 * Drop options another option beats on every listed criterion (all to be
 * minimised): lossless for a screen whose estimate is monotone in them.
 */
export function prune<T>(items: readonly T[], crit: (t: T) => number[]): T[] {
  const c = items.map(crit);
  return items.filter((_, a) =>
    !c.some((cb, b) => b !== a && cb.every((x, k) => x <= c[a][k]) && cb.some((x, k) => x < c[a][k])),
  );
}
