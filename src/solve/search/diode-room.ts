import { topologyOf } from '../../topology/index.js';
import { vgsForGmid } from '../../stack/index.js';
import type { LengthSlice } from '../../device/types.js';
import type { SolveContext } from '../context.js';
import { candidateWidths } from '../evaluate/evaluate.js';
import type { Candidate } from './candidate.js';
import { EDGE_STEPS, pulledToLimit } from './width-edge.js';
import { edgeOf } from '../../numeric/index.js';

/** The diode's VGS and width at gm/ID `g` (VDS = VGS, VSB = 0), or null where the table does not reach it. */
function diodeAt(slice: LengthSlice, g: number, current: number): { vgs: number; w: number } | null {
  const vgs = vgsForGmid(slice, g, 'diode', 0);
  if (vgs === null) return null;
  const jd = slice.jd(vgs, vgs, 0);
  return jd > 0 ? { vgs, w: current / jd } : null;
}

/**
 * The bottom diodes of one length within the width limits and the gm/ID range (gm/ID and VGS): those of the search's
 * grid, and the width edge between two grid points (at a fixed bias W = I/jd rises and VGS falls with gm/ID, so the
 * edge is the diode with the most room left within the limit, and the lowest VGS of the list is the length's lowest).
 */
function allowedBottoms(ctx: SolveContext, slice: LengthSlice, wmax = ctx.wmax): { g: number; vgs: number }[] {
  const fits = (d: { vgs: number; w: number } | null) => d !== null && d.w <= wmax && d.w >= ctx.wmin * (1 - 1e-9);
  const out: { g: number; vgs: number }[] = [];
  let lastFit = NaN;
  let firstWide = NaN;
  for (const g of ctx.gmids) {
    const d = diodeAt(slice, g, ctx.spec.current);
    if (fits(d)) {
      lastFit = g;
      out.push({ g, vgs: d!.vgs });
    } else if (!Number.isNaN(lastFit) && d !== null && d.w > wmax) {
      firstWide = g;
      break;
    }
  }
  if (Number.isNaN(lastFit) || Number.isNaN(firstWide)) return out;
  const lo = edgeOf((m) => fits(diodeAt(slice, m, ctx.spec.current)), lastFit, firstWide, EDGE_STEPS);
  const edge = diodeAt(slice, lo, ctx.spec.current);
  if (lo > lastFit && edge !== null) out.push({ g: lo, vgs: edge.vgs });
  return out;
}

/** The gm/ID values of one length of a bottom diode that leave the device above it room at mid-span (VGS below v_mid). */
function roomyBottoms(ctx: SolveContext, slice: LengthSlice): number[] {
  return allowedBottoms(ctx, slice).filter((d) => d.vgs < ctx.vmid).map((d) => d.g);
}

/** A stacked-bias topology: two devices, the bottom one a diode, no VDS setpoint (what this file searches). */
function stackedBias(topology: string): boolean {
  const shape = topologyOf(topology);
  return !!shape.bottomDiode && shape.setpoints === 0 && shape.roles.length === 2;
}

/**
 * The most VDS any allowed bottom diode of a stacked-bias topology leaves the device above it at mid-span, V: v_mid
 * minus the lowest VGS of a bottom diode within the width limits (`wmax` for the upper one) and the gm/ID range over
 * every allowed length (zero or below: no design of the topology exists in the allowed space). Null for other
 * topologies, or when no bottom diode fits the limits at all.
 */
export function bottomRoom(ctx: SolveContext, topology: string, wmax = ctx.wmax): number | null {
  if (!stackedBias(topology)) return null;
  let lowest = Infinity;
  for (const l of ctx.lengths) for (const d of allowedBottoms(ctx, ctx.slice(ctx.nominal, l), wmax)) lowest = Math.min(lowest, d.vgs);
  return Number.isFinite(lowest) ? ctx.vmid - lowest : null;
}

/**
 * Every bottom diode of a stacked-bias topology the table realises on the allowed lengths and gm/ID range is narrower
 * than the minimum width (at a fixed bias W = I/jd rises with gm/ID: each length's widest is at the highest gm/ID it
 * realises). False for other topologies, or when none is realised.
 */
export function bottomsTooNarrow(ctx: SolveContext, topology: string): boolean {
  if (!stackedBias(topology)) return false;
  let realised = false;
  for (const l of ctx.lengths) {
    const slice = ctx.slice(ctx.nominal, l);
    for (let j = ctx.gmids.length - 1; j >= 0; j--) {
      const d = diodeAt(slice, ctx.gmids[j], ctx.spec.current);
      if (d === null) continue;
      if (d.w >= ctx.wmin * (1 - 1e-9)) return false;
      realised = true;
      break;
    }
  }
  return realised;
}

/**
 * The narrowest width limit under which a stacked-bias topology has any design at all, m: the least, over bottom
 * diodes of every allowed length and gm/ID leaving the top room at mid-span (wider than the spec's limit allowed too)
 * and tops of every allowed length, of the wider of the two. At a fixed bias W = I/jd falls with gm/ID, so each top is
 * taken at the lowest gm/ID the table realises; a bottom widens with its gm/ID while the room it leaves (and so the
 * narrowest top's bias) grows, so the least of the wider lies where the two widths cross, found between grid points.
 * Null for other topologies, or when the table realises no such pair.
 */
export function narrowestDesign(ctx: SolveContext, topology: string): number | null {
  if (!stackedBias(topology)) return null;
  const gs = ctx.gmids;
  const c: Candidate = { topology, l: [0, 0], gmid: [0, 0], setpoints: [] };
  const widths = (g2: number): ArrayLike<number> | null => {
    c.gmid[1] = g2;
    return candidateWidths(ctx, c);
  };
  // The bottom's and the narrowest top's widths above bottom gm/ID g1 (null: no room, or no top realised).
  const pair = (slice: LengthSlice, g1: number): [number, number] | null => {
    const d = diodeAt(slice, g1, ctx.spec.current);
    if (d === null || !(d.vgs < ctx.vmid) || d.w < ctx.wmin * (1 - 1e-9)) return null;
    c.gmid[0] = g1;
    for (let j = 0; j < gs.length; j++) {
      const w = widths(gs[j]);
      if (w === null) continue;
      let top = w[1];
      // The lowest gm/ID realised lies between this grid point and the one below.
      let lo = j > 0 ? gs[j - 1] : gs[0];
      let hi = gs[j];
      for (let it = 0; j > 0 && it < EDGE_STEPS; it++) {
        const m = 0.5 * (lo + hi);
        const wm = widths(m);
        if (wm === null) lo = m;
        else {
          hi = m;
          top = wm[1];
        }
      }
      return [w[0], top];
    }
    return null;
  };
  let narrowest = Infinity;
  for (const l1 of ctx.lengths) {
    const slice = ctx.slice(ctx.nominal, l1);
    for (const l2 of ctx.lengths) {
      c.l = [l1, l2];
      let last: { g: number; p: [number, number] } | null = null;
      for (const g1 of gs) {
        const p = pair(slice, g1);
        if (p === null) {
          last = null;
          continue;
        }
        narrowest = Math.min(narrowest, Math.max(p[0], p[1]));
        // The widths cross between the last grid point and this one: the wider of the two is least there.
        if (last !== null && last.p[0] < last.p[1] && p[0] >= p[1]) {
          let lo = last.g;
          let hi = g1;
          for (let it = 0; it < EDGE_STEPS; it++) {
            const m = 0.5 * (lo + hi);
            const q = pair(slice, m);
            if (q === null) break;
            narrowest = Math.min(narrowest, Math.max(q[0], q[1]));
            if (q[0] < q[1]) lo = m;
            else hi = m;
          }
        }
        last = { g: g1, p };
      }
    }
  }
  return Number.isFinite(narrowest) ? narrowest : null;
}

/**
 * Candidates of a stacked-bias topology (bottom diode, no setpoints) over the whole allowed space, for when its
 * screen came back empty: the screen leaves the device above the diode at least 50 mV at mid-span and looks only at
 * grid gm/ID values, so a high-VT device at a high current (or a low mid-span voltage, or a tight width limit) can
 * have every grid diode within the width limit too high for it, while diodes between grid points (at the width limit)
 * or with less room still make usable designs. Each bottom diode with room (roomyBottoms) under every top device of
 * the grid, a top wider than the limit pulled back to it. Empty for other topologies (their screens' setpoints leave
 * room by construction; search's `lowered` and the saturation retry cover them).
 */
export function diodeRoomCandidates(ctx: SolveContext, topology: string): Candidate[] {
  if (!stackedBias(topology)) return [];
  return pulledToLimit(ctx, diodeRoomRaw(ctx, topology));
}

function* diodeRoomRaw(ctx: SolveContext, topology: string): Generator<Candidate> {
  for (const l1 of ctx.lengths) {
    for (const g1 of roomyBottoms(ctx, ctx.slice(ctx.nominal, l1))) {
      for (const l2 of ctx.lengths) {
        for (const g2 of ctx.gmids) {
          const c: Candidate = { topology, l: [l1, l2], gmid: [g1, g2], setpoints: [] };
          // A top the table cannot realise at this bias is left out (pulling it would move the bottom).
          if (candidateWidths(ctx, c) !== null) yield c;
        }
      }
    }
  }
}
