import { topologyOf } from '../../topology/index.js';
import type { SolveContext } from '../context.js';
import type { Candidate } from './candidate.js';
import { pulledToLimit } from './width-edge.js';

// Setpoint spacing of the fallback's grid, V (widened in 25 mV steps to keep at most LEVELS setpoints per device, so
// a high mid-span stays a few thousand candidates; at 50 mV the climbs from it missed a Rout ridge the reference finds
// 17 % higher), its lowest setpoint, and the room the top device keeps at mid-span (the last two shared with
// width-room.ts's fallback).
const STEP = 0.025;
const LEVELS = 16;
export const LOWEST = 0.05;
export const TOP_ROOM = 0.05;

/** Up to three of the allowed lengths: the shortest, the longest and the one between them. */
export function someLengths(lengths: readonly number[]): number[] {
  if (lengths.length <= 3) return [...lengths];
  return [lengths[0], lengths[Math.floor((lengths.length - 1) / 2)], lengths[lengths.length - 1]];
}

/**
 * Candidates of a topology with VDS setpoints (the triple) over the whole allowed space, for when its screen came back
 * empty: the screen keeps the setpoints' sum 50 mV under a cap of mid-span − 0.15 V and looks at every other grid
 * gm/ID, so at a high current (or a tight width limit) every grid device can be too wide or out of saturation while
 * devices between grid points at the width limit, with setpoints up to mid-span, still make usable designs. Every
 * pair of setpoints on a coarse grid leaving the top TOP_ROOM at mid-span, a few lengths per device, and each device at
 * every grid gm/ID pulled back to the width limit (toWidthLimit); the climbs start from these. Empty for other
 * topologies (the stacked cascode has diodeRoomCandidates).
 */
export function setpointRoomCandidates(ctx: SolveContext, topology: string): Candidate[] {
  const shape = topologyOf(topology);
  if (shape.bottomDiode || shape.setpoints !== 2 || shape.roles.length !== 3) return [];
  return pulledToLimit(ctx, setpointRoomRaw(ctx, topology));
}

function* setpointRoomRaw(ctx: SolveContext, topology: string): Generator<Candidate> {
  const ls = someLengths(ctx.lengths);
  const gs = ctx.gmids.filter((_, j) => j % 2 === 1 || j === ctx.gmids.length - 1);
  const room = ctx.vmid - TOP_ROOM;
  const step = Math.max(STEP, Math.ceil((room - 2 * LOWEST) / (LEVELS - 1) / 0.025 - 1e-9) * 0.025);
  for (let s1 = LOWEST; s1 + LOWEST <= room + 1e-9; s1 += step) {
    for (let s2 = LOWEST; s1 + s2 <= room + 1e-9; s2 += step) {
      const setpoints = [Math.round(s1 * 1e6) / 1e6, Math.round(s2 * 1e6) / 1e6];
      for (const l1 of ls) for (const l2 of ls) for (const l3 of ls) {
        for (const g of gs) yield { topology, l: [l1, l2, l3], gmid: [g, g, g], setpoints };
      }
    }
  }
}
