/**
 * One transistor evaluated as a simulator would report it: current, analytic
 * conductances, capacitances. For the invented "Larkspur Microsystems" demo
 * kits (fictional, not a real process).
 */
import { capacitances } from './capacitance.js';
import { smallSignal } from './derivatives.js';
import { checkBias, ekvCurrent, type Bias } from './ekv.js';
import type { EkvParams } from './params.js';
import type { StoredQuantity } from '../table/types.js';

/** One value of every stored quantity (the table's record of a bias point), SI. */
export type DeviceValues = Record<StoredQuantity, number>;

/** All magnitudes; gmb = ∂ID/∂VBS = −∂ID/∂VSB. */
export function evalDevice(p: EkvParams, b: Bias): DeviceValues {
  checkBias(p, b);
  const s = smallSignal(p, b);
  const c = capacitances(p, b, s);
  return { id: s.id, gm: s.gm, gds: s.gds, gmb: s.gmb, cgg: c.cgg, cgs: c.cgs, cgd: c.cgd, cdd: c.cdd };
}

/** Step for central differences, V: small against UT, large against rounding. */
export const DIFF_STEP = 1e-6;

/** [gm, gds, gmb] by central differences of ekvCurrent, to cross-check the analytic ones. */
export function centralDifferences(p: EkvParams, b: Bias, h = DIFF_STEP): [number, number, number] {
  const d = (key: 'vgs' | 'vds' | 'vsb'): number =>
    (ekvCurrent(p, { ...b, [key]: b[key] + h }) - ekvCurrent(p, { ...b, [key]: b[key] - h })) / (2 * h);
  return [d('vgs'), d('vds'), -d('vsb')];
}
