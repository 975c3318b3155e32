import type { StackSpec } from '../../design/types.js';
import type { StackEval } from './stack-eval.js';
import { VOLT_SCALE, marginsFor, type Margins } from '../../policy.js';

export type { Margins };

/** A spec target. */
export type Target = 'rout' | 'headroom' | 'iout' | 'mismatch' | 'saturation' | 'width';

/** Index of the device below the top one with the least VDS − VDSsat at mid-span, −1 for a single device. */
export function leastSaturated(ev: Pick<StackEval, 'mid' | 'vdsat'>): number {
  // Each device's values read once: they are getters over a packed point, costly before this is compiled.
  const devices = ev.mid.devices;
  const vdsat = ev.vdsat;
  let worst = -1;
  let least = NaN;
  for (let k = 0; k < devices.length - 1; k++) {
    const slack = devices[k].vds - vdsat[k];
    if (worst < 0 || slack < least) {
      worst = k;
      least = slack;
    }
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
  if (!ev) return { ...marginsFor(spec, { rout: 0, headroom: Infinity, iout: NaN, sigma, saturation: -Infinity }), iout: -Infinity };
  return marginsFor(spec, { rout: ev.routAtTarget, headroom: ev.headroom, iout: ev.iout, sigma, saturation: saturationMargin(ev), width: widest(ev).w });
}

/** The widest output device and its index. */
export function widest(ev: Pick<StackEval, 'devices'>): { k: number; w: number } {
  let k = 0;
  for (let j = 1; j < ev.devices.length; j++) if (ev.devices[j].w > ev.devices[k].w) k = j;
  return { k, w: ev.devices[k]?.w ?? 0 };
}

/** The target with the smallest margin. */
export function tightest(m: Margins): Target {
  const order: Target[] = ['rout', 'headroom', 'iout', 'mismatch', 'saturation', 'width'];
  return order.reduce((a, b) => (m[b] < m[a] ? b : a));
}
