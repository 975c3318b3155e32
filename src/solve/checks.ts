import type { StackSpec } from '../spec/types.js';
import { formatEng } from '../units/index.js';
import type { StackEval } from './stackeval.js';

// Devices below the top one, from the rail up.
const LOWER_ROLES = ['bottom', 'middle'];

/** Allowed deviation of the mid-span current from the target. */
export const CURRENT_WINDOW = 0.01;

export type Target = 'rout' | 'headroom' | 'iout' | 'mismatch' | 'saturation' | 'width';

/** Margin of each target (≥ 0 met, < 0 missed), normalised so they compare. */
export interface Margins {
  rout: number;
  headroom: number;
  iout: number;
  mismatch: number;
  /** Lowest VDS − VDSsat at mid-span over the devices below the top one, per 50 mV (Infinity for one device). */
  saturation: number;
  /** ln(width limit / widest output device): ≥ 0 when every device fits. */
  width: number;
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

/**
 * A provided headroom as reported everywhere (results, words, JSON): rounded up to the whole mV, so a
 * reported value never reads as meeting a target the design misses (the margin uses the raw value).
 */
export function reportedHeadroom(h: number): number {
  return Number.isFinite(h) ? Math.ceil(h * 1000 - 1e-6) / 1000 : h;
}

/** Margins of one evaluated stack (null eval: nothing is met). */
export function marginsOf(spec: StackSpec, ev: StackEval | null, sigma: number | undefined): Margins {
  const mismatch = spec.mismatch === undefined || sigma === undefined ? Infinity : 1 - sigma / spec.mismatch;
  if (!ev) return { rout: -Infinity, headroom: -Infinity, iout: -Infinity, mismatch, saturation: -Infinity, width: Infinity };
  return {
    rout: ev.routAtTarget > 0 ? Math.log(ev.routAtTarget / spec.rout) : -Infinity,
    headroom: Number.isFinite(ev.headroom) ? (spec.headroom - ev.headroom) / VOLT_SCALE : -Infinity,
    iout: 1 - Math.abs(ev.iout - spec.current) / (CURRENT_WINDOW * spec.current),
    mismatch,
    saturation: saturationMargin(ev),
    width: spec.wmax === undefined ? Infinity : Math.log(spec.wmax / widest(ev).w),
  };
}

export function meetsAll(m: Margins): boolean {
  return m.rout >= 0 && m.headroom >= 0 && m.iout >= 0 && m.mismatch >= 0 && m.saturation >= 0 && m.width >= 0;
}

/** The widest output device and its index. */
export function widest(ev: Pick<StackEval, 'devices'>): { k: number; w: number } {
  let k = 0;
  for (let j = 1; j < ev.devices.length; j++) if (ev.devices[j].w > ev.devices[k].w) k = j;
  return { k, w: ev.devices[k]?.w ?? 0 };
}

/** Sum of shortfalls; 0 when every target is met. Infinite shortfalls are capped so designs still rank. */
export function violation(m: Margins): number {
  const cap = (x: number) => Math.min(Math.max(0, -x), 50);
  return cap(m.rout) + cap(m.headroom) + cap(m.iout) + cap(m.mismatch) + cap(m.saturation) + cap(m.width);
}

/** The target with the smallest margin. */
export function tightest(m: Margins): Target {
  const order: Target[] = ['rout', 'headroom', 'iout', 'mismatch', 'saturation', 'width'];
  return order.reduce((a, b) => (m[b] < m[a] ? b : a));
}

/** Words for a target at one evaluation: "rout 12.3 MΩ < 20 MΩ", "headroom 0.52 V ≤ 0.55 V". */
export function describe(target: Target, spec: StackSpec, ev: StackEval | null, sigma: number | undefined): string {
  if (!ev) return `${target}: the table does not cover the mid-span bias`;
  switch (target) {
    case 'rout': {
      const ok = ev.routAtTarget >= spec.rout;
      return `rout ${formatEng(ev.routAtTarget, 'Ω')} ${ok ? '≥' : '<'} ${formatEng(spec.rout, 'Ω')} at ${spec.headroom.toFixed(3)} V`;
    }
    case 'headroom': {
      const ok = ev.headroom <= spec.headroom;
      const h = Number.isFinite(ev.headroom) ? `${reportedHeadroom(ev.headroom).toFixed(3)} V` : 'never met';
      return `headroom ${h} ${ok ? '≤' : '>'} ${spec.headroom.toFixed(3)} V`;
    }
    case 'iout': {
      const dev = (100 * (ev.iout - spec.current)) / spec.current;
      return `iout ${formatEng(ev.iout, 'A')} is ${dev.toFixed(2)} % off ${formatEng(spec.current, 'A')}`;
    }
    case 'mismatch':
      return `mismatch σ ${((sigma ?? NaN) * 100).toFixed(3)} % vs ${((spec.mismatch ?? NaN) * 100).toFixed(3)} %`;
    case 'width': {
      const { k, w } = widest(ev);
      const role = ev.devices.length === 1 ? 'bottom' : k === ev.devices.length - 1 ? 'top' : LOWER_ROLES[k];
      const limit = spec.wmax ?? Infinity;
      return `width: ${role} W ${formatEng(w, 'm')} ${w <= limit ? '≤' : '>'} the ${formatEng(limit, 'm')} width limit`;
    }
    case 'saturation': {
      const k = leastSaturated(ev);
      if (k < 0) return 'saturation: a single device has no lower device to keep saturated';
      const vds = ev.mid.devices[k].vds;
      const ok = vds >= ev.vdsat[k];
      return `saturation: ${LOWER_ROLES[k]} VDS ${formatEng(vds, 'V')} ${ok ? '≥' : '<'} VDSsat ${formatEng(ev.vdsat[k], 'V')} at mid-span`;
    }
  }
}
