import type { Candidate } from '../../topology/types.js';

export type { Candidate };

/**
 * Identity of a candidate for de-duplication (sub-nm, 1e-4 /V and 0.1 mV resolution):
 * "topology|L,L…|gm/ID,…|setpoint,…" in those integer units. Written out (no map/join): called per move and per
 * screened candidate, it builds only the string.
 */
export function candidateKey(c: Candidate): string {
  let s = c.topology + '|';
  const l = c.l;
  for (let k = 0; k < l.length; k++) s += (k > 0 ? ',' : '') + Math.round(l[k] * 1e10);
  s += '|';
  const g = c.gmid;
  for (let k = 0; k < g.length; k++) s += (k > 0 ? ',' : '') + Math.round(g[k] * 1e4);
  s += '|';
  const v = c.setpoints;
  for (let k = 0; k < v.length; k++) s += (k > 0 ? ',' : '') + Math.round(v[k] * 1e4);
  return s;
}

/** Continuous coordinates of a candidate: gm/ID per device, then the setpoints (the order the climb's moves use). */
export function coordinates(c: Candidate): number[] {
  return [...c.gmid, ...c.setpoints];
}

/** One value per continuous coordinate of `c` (see coordinates): `gmid` for each device's gm/ID, `setpoint` for each setpoint. */
export function perCoordinate(c: Candidate, gmid: number, setpoint: number): number[] {
  return [...c.gmid.map(() => gmid), ...c.setpoints.map(() => setpoint)];
}
