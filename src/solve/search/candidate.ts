import type { Candidate } from '../../topology/types.js';

export type { Candidate };

/** Lowest VDS setpoint a move or probe takes, V (below it a lower device has no room to conduct its current). */
export const SETPOINT_MIN = 0.02;

/** Continuous coordinates of a candidate: gm/ID per device, then the setpoints (the order the climb's moves use). */
export function coordinates(c: Candidate): number[] {
  return [...c.gmid, ...c.setpoints];
}

/** One value per continuous coordinate of `c` (see coordinates): `gmid` for each device's gm/ID, `setpoint` for each setpoint. */
export function perCoordinate(c: Candidate, gmid: number, setpoint: number): number[] {
  return [...c.gmid.map(() => gmid), ...c.setpoints.map(() => setpoint)];
}
