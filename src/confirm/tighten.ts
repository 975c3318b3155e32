import type { StackResult } from '../solve/types.js';
import { turn, turnAll } from './knobs.js';
import { tableFigures } from './table-model.js';
import type { StepInput } from './correct.js';

/** Headroom margin in simulation worth taking back, V. */
export const TIGHTEN_MARGIN = 0.02;
/** Headroom left below target after shrinking, V. */
const KEEP = 0.008;
/** Rout kept above target after shrinking (fraction). */
const ROUT_KEEP = 0.02;
/** Smallest shrink worth a round (ln of the width factor). */
const MIN_SHRINK = 0.03;

/**
 * For a confirmed design with headroom to spare in simulation: every width
 * (output and bias) shrunk by one factor, as far as the tables, offset by what
 * simulation showed at each corner, keep headroom KEEP below target and Rout
 * above it, the output widths trimmed to keep the current. Null when there is
 * too little margin to take back.
 */
export function shrinkStep(inp: StepInput): StackResult | null {
  const { spec, figures } = inp;
  if (!figures.every((f) => spec.headroom - f.headroom >= TIGHTEN_MARGIN)) return null;
  const base = figures.map((f) => ({ f, t: tableFigures(inp.design, spec, inp.kit, f.corner, inp.supply) }));
  if (base.some((b) => !b.t || !Number.isFinite(b.t.headroom))) return null;
  // A smaller design runs at a higher overdrive, where the mirror's VDS mismatch moves the current: the output
  // widths take that back (tables' ratio times the simulated current, centred on the target over the corners).
  const shrunk = (x: number): StackResult | null => {
    const d = turn(inp.design, 'shrink', x);
    const logs: number[] = [];
    for (const { f, t } of base) {
      const s = tableFigures(d, spec, inp.kit, f.corner, inp.supply);
      if (!s) return null;
      logs.push(Math.log((f.iout * s.iout) / (t!.iout * spec.current)));
    }
    return turnAll(d, { current: -(Math.max(...logs) + Math.min(...logs)) / 2 });
  };
  const ok = (x: number): boolean => {
    const d = shrunk(x);
    if (!d) return false;
    return base.every(({ f, t }) => {
      const s = tableFigures(d, spec, inp.kit, f.corner, inp.supply);
      if (!s || !Number.isFinite(s.headroom) || !(s.rout > 0)) return false;
      const h = s.headroom + (f.headroom - t!.headroom);
      const r = s.rout * (f.rout / t!.rout);
      return h <= spec.headroom - KEEP && (!Number.isFinite(r) || r >= spec.rout * (1 + ROUT_KEEP));
    });
  };
  const x = deepestShrink(ok);
  return x === null ? null : shrunk(x);
}

/**
 * The deepest shrink `ok` allows, as ln of the width factor: bisected between
 * no shrink and a factor of e^-1.5; null when it is less than MIN_SHRINK.
 */
export function deepestShrink(ok: (x: number) => boolean): number | null {
  let lo = -1.5;
  let hi = 0;
  if (ok(lo)) hi = lo;
  else {
    for (let k = 0; k < 10; k++) {
      const mid = 0.5 * (lo + hi);
      if (ok(mid)) hi = mid;
      else lo = mid;
    }
  }
  return hi <= -MIN_SHRINK ? hi : null;
}
