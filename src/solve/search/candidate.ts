import type { Candidate } from '../../topology/types.js';
import type { SolveContext } from '../context.js';

export type { Candidate };

// Candidates are built as { topology, l, gmid, setpoints } literals, in that order, never spread from another one: a
// spread copy gets a hidden class of its own per site, and each new one met by an optimised function that reads
// candidates (the candidate key's probe, the climb's moves) throws that code away to be compiled again (marsh-wren:
// about 0.6 % of its instructions, in seven deoptimisations).

/** Lowest VDS setpoint a move or probe takes, V (below it a lower device has no room to conduct its current). */
export const SETPOINT_MIN = 0.02;

/** Continuous coordinates of a candidate: gm/ID per device, then the setpoints (the order the climb's moves use). */
export function coordinates(c: Candidate): number[] {
  return [...c.gmid, ...c.setpoints];
}

/** `c` with setpoint k at v, rounded to the candidate key's µV grid (so the same point reached twice has one key). */
export function withSetpoint(c: Candidate, k: number, v: number): Candidate {
  return { topology: c.topology, l: c.l, gmid: c.gmid, setpoints: c.setpoints.map((x, j) => (j === k ? Math.round(v * 1e6) / 1e6 : x)) };
}

/** `c` with device k's gm/ID at g, rounded to 1e-9 (so the same point reached twice has one key). */
export function withGmid(c: Candidate, k: number, g: number): Candidate {
  return { topology: c.topology, l: c.l, gmid: c.gmid.map((v, j) => (j === k ? Math.round(g * 1e9) / 1e9 : v)), setpoints: c.setpoints };
}

/** Whether gm/ID g lies within the search's gm/ID range (to 1e-9, for values stepped onto its ends). */
export function gmidInRange(ctx: SolveContext, g: number): boolean {
  return g >= ctx.gmids[0] - 1e-9 && g <= ctx.gmids[ctx.gmids.length - 1] + 1e-9;
}

/** One value per continuous coordinate of `c` (see coordinates): `gmid` for each device's gm/ID, `setpoint` for each setpoint. */
export function perCoordinate(c: Candidate, gmid: number, setpoint: number): number[] {
  return [...c.gmid.map(() => gmid), ...c.setpoints.map(() => setpoint)];
}
