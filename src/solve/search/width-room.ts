import { topologyOf } from '../../topology/index.js';
import type { SolveContext } from '../context.js';
import type { Candidate } from './candidate.js';
import { pulledToLimit } from './width-edge.js';
import { LOWEST, TOP_ROOM, someLengths } from './setpoint-room.js';

// Setpoint spacing, V, by setpoint count (one setpoint: a line; two: a coarser grid of pairs); the lowest setpoint and
// the top device's room at mid-span are setpoint-room.ts's. Coarse on purpose: the climbs and line probes refine from these.
const STEP = [0, 0.05, 0.1];

/**
 * Candidates with every device on the width limit, for when nothing the searches evaluated is usable (every design too
 * wide, say, at a high current under a tight limit): each tuple of lengths and of setpoints on a coarse grid, every
 * device from the highest grid gm/ID pulled back to the limit (toWidthLimit). The usable designs can all lie between
 * the gm/ID grid's points (the lowest not realisable, the next too wide) and need every length changed at once
 * (the shortest devices carry the current in the least width), which neither a climb's steps nor a line probe's
 * one-coordinate moves reach.
 */
export function widthRoomCandidates(ctx: SolveContext, topology: string): Candidate[] {
  return pulledToLimit(ctx, widthRoomRaw(ctx, topology));
}

function* widthRoomRaw(ctx: SolveContext, topology: string): Generator<Candidate> {
  const shape = topologyOf(topology);
  const n = shape.roles.length;
  const m = shape.setpoints;
  if (m >= STEP.length) return;
  // Every allowed length for up to two devices; for more, a few (the combinations multiply).
  const ls = n <= 2 ? ctx.lengths : someLengths(ctx.lengths);
  const gHi = ctx.gmids[ctx.gmids.length - 1];
  const room = ctx.vmid - TOP_ROOM;
  const setpointTuples: number[][] = [];
  const fill = (prefix: number[], sum: number) => {
    if (prefix.length === m) {
      setpointTuples.push(prefix);
      return;
    }
    for (let s = LOWEST; sum + s + LOWEST * (m - prefix.length - 1) <= room + 1e-9; s += STEP[m]) fill([...prefix, Math.round(s * 1e6) / 1e6], sum + s);
  };
  fill([], 0);
  let lengthTuples: number[][] = [[]];
  for (let k = 0; k < n; k++) lengthTuples = lengthTuples.flatMap((t) => ls.map((l) => [...t, l]));
  for (const l of lengthTuples) {
    for (const setpoints of setpointTuples) yield { topology, l, gmid: l.map(() => gHi), setpoints };
  }
}
