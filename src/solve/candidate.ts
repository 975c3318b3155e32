import type { Topology } from '../design/types.js';

/** One point in the design space: L and gm/ID per device, plus the VDS setpoints. */
export interface Candidate {
  topology: Topology;
  l: number[];
  gmid: number[];
  setpoints: number[];
}

/** Identity of a candidate for de-duplication (sub-nm, 1e-4 /V and 0.1 mV resolution). */
export function candidateKey(c: Candidate): string {
  return `${c.topology}|${c.l.map((x) => Math.round(x * 1e10)).join(',')}|${c.gmid.map((g) => Math.round(g * 1e4)).join(',')}|${c.setpoints.map((s) => Math.round(s * 1e4)).join(',')}`;
}
