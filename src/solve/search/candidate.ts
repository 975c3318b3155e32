import type { Candidate } from '../../topology/types.js';

export type { Candidate };

/** Identity of a candidate for de-duplication (sub-nm, 1e-4 /V and 0.1 mV resolution). */
export function candidateKey(c: Candidate): string {
  return `${c.topology}|${c.l.map((x) => Math.round(x * 1e10)).join(',')}|${c.gmid.map((g) => Math.round(g * 1e4)).join(',')}|${c.setpoints.map((s) => Math.round(s * 1e4)).join(',')}`;
}
