import type { StackSpec } from '../design/types.js';
import type { StackEval } from './stackeval.js';

/** Allowed deviation of the mid-span current from the target. */
export const CURRENT_WINDOW = 0.01;

export type Target = 'rout' | 'headroom' | 'iout' | 'mismatch' | 'saturation';

/** Margin of each target (≥ 0 met, < 0 missed), normalised so they compare. */
export interface Margins {
  rout: number;
  headroom: number;
  iout: number;
  mismatch: number;
  /** Lowest VDS − VDSsat at mid-span over the devices below the top one, per 50 mV (Infinity for one device). */
  saturation: number;
}

// Headroom and saturation margins are per 50 mV, so 1 unit weighs like a factor e of Rout.
const VOLT_SCALE = 0.05;

/** Index of the device below the top one with the least VDS − VDSsat at mid-span, −1 for a single device. */
export function leastSaturated(ev: Pick<StackEval, 'mid' | 'vdsat'>): number {
  let worst = -1;
  for (let k = 0; k < ev.mid.devices.length - 1; k++) {
    const slack = ev.mid.devices[k].vds - ev.vdsat[k];
    if (worst < 0 || slack < ev.mid.devices[worst].vds - ev.vdsat[worst]) worst = k;
  }
  return worst;
}

/** Saturation margin of an evaluated stack: lowest (VDS − VDSsat)/50 mV below the top device. */
export function saturationMargin(ev: Pick<StackEval, 'mid' | 'vdsat'>): number {
  const k = leastSaturated(ev);
  return k < 0 ? Infinity : (ev.mid.devices[k].vds - ev.vdsat[k]) / VOLT_SCALE;
}

/** Margins of one evaluated stack (null eval: nothing is met). */
export function marginsOf(spec: StackSpec, ev: StackEval | null, sigma: number | undefined): Margins {
  const mismatch = spec.mismatch === undefined || sigma === undefined ? Infinity : 1 - sigma / spec.mismatch;
  if (!ev) return { rout: -Infinity, headroom: -Infinity, iout: -Infinity, mismatch, saturation: -Infinity };
  return {
    rout: ev.routAtTarget > 0 ? Math.log(ev.routAtTarget / spec.rout) : -Infinity,
    headroom: Number.isFinite(ev.headroom) ? (spec.headroom - ev.headroom) / VOLT_SCALE : -Infinity,
    iout: 1 - Math.abs(ev.iout - spec.current) / (CURRENT_WINDOW * spec.current),
    mismatch,
    saturation: saturationMargin(ev),
  };
}

export function meetsAll(m: Margins): boolean {
  return m.rout >= 0 && m.headroom >= 0 && m.iout >= 0 && m.mismatch >= 0 && m.saturation >= 0;
}

/** Sum of shortfalls; 0 when every target is met. Infinite shortfalls are capped so designs still rank. */
export function violation(m: Margins): number {
  const cap = (x: number) => Math.min(Math.max(0, -x), 50);
  return cap(m.rout) + cap(m.headroom) + cap(m.iout) + cap(m.mismatch) + cap(m.saturation);
}

/** The target with the smallest margin. */
export function tightest(m: Margins): Target {
  const order: Target[] = ['rout', 'headroom', 'iout', 'mismatch', 'saturation'];
  return order.reduce((a, b) => (m[b] < m[a] ? b : a));
}
