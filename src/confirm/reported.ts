import { reportedHeadroom } from '../policy.js';
import type { Miss, Simulated } from './types.js';

/**
 * A stack's simulated figures as a confirmation returns them: headrooms rounded up to the whole mV, as every
 * reported headroom is (src/policy.ts), so text, JSON and report read one number. The correction loop judges the
 * raw figures; only the outcome is rounded.
 */
export function reportedSimulated(sim: Simulated): Simulated {
  return { ...sim, headroom: reportedHeadroom(sim.headroom), corners: sim.corners.map((c) => ({ ...c, headroom: reportedHeadroom(c.headroom) })) };
}

/** A missed target as a confirmation returns it: a headroom achieved rounded up to the whole mV. */
export function reportedMiss(m: Miss): Miss {
  return m.target === 'headroom' && m.achieved !== null ? { ...m, achieved: reportedHeadroom(m.achieved) } : m;
}
