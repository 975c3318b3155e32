import type { SolveContext } from '../context.js';
import { candidateWidths } from '../evaluate/evaluate.js';
import type { Candidate } from './candidate.js';
import { anyWider } from './width-edge.js';

// Setpoint spacing of the probes, V: finer than the ridges seen in Rout at a headroom target where no device is
// saturated (a few tens of mV wide), coarse enough to stay a few dozen probes per setpoint.
const PROBE_VSTEP = 0.05;
// Lowest setpoint (as the climb's moves) and the room the top device keeps at mid-span, V.
const SETPOINT_MIN = 0.02;
const TOP_ROOM = 0.02;
// Bisection steps of a probe's width edge over the whole gm/ID range (a few 1e-4 /V on the default range).
const EDGE_STEPS = 16;

/**
 * Long moves from a design: each coordinate alone over its whole allowed range (each length over the allowed lengths,
 * each gm/ID on the search's grid, each setpoint every PROBE_VSTEP up to mid-span, and the setpoint traded between
 * adjacent devices), the rest kept. A climb only ever steps to neighbours, so a figure with several far-apart maxima
 * over one coordinate (Rout at a headroom target where nothing is saturated has them: at a lower device's saturation
 * edge and again well above it) keeps it on the first one it reaches. Probes wider than the width limit are pulled
 * back to it (see toWidthLimit).
 */
export function lineProbes(ctx: SolveContext, c: Candidate): Candidate[] {
  const out: Candidate[] = [];
  // The probe, pulled to the width limit when too wide; 'pulled' when it was (null: it fits nowhere).
  const add = (d: Candidate): 'fits' | 'pulled' | null => {
    const f = toWidthLimit(ctx, d);
    if (f) out.push(f);
    return f === null ? null : f === d ? 'fits' : 'pulled';
  };
  const copy = (): Candidate => ({ topology: c.topology, l: c.l, gmid: [...c.gmid], setpoints: [...c.setpoints] });
  for (let k = 0; k < c.l.length; k++) {
    for (const l of ctx.lengths) {
      if (Math.abs(l - c.l[k]) < 1e-15) continue;
      const d = copy();
      d.l = [...c.l];
      d.l[k] = l;
      add(d);
      // And the device at its widest: where the width limit binds, the best designs keep each device on it, so a
      // new length is worth most with the gm/ID that brings the device back to the limit (toWidthLimit pulls it there).
      const gHi = ctx.gmids[ctx.gmids.length - 1];
      if (c.gmid[k] < gHi - 1e-9) {
        const e = copy();
        e.l = d.l;
        e.gmid[k] = gHi;
        add(e);
      }
    }
  }
  for (let k = 0; k < c.gmid.length; k++) {
    for (const g of ctx.gmids) {
      if (Math.abs(g - c.gmid[k]) < 1e-9) continue;
      const d = copy();
      d.gmid[k] = g;
      // Up the grid the device only gets wider: every probe past the first one pulled back lands on the same edge.
      if (add(d) === 'pulled') break;
    }
  }
  const sum = c.setpoints.reduce((a, b) => a + b, 0);
  for (let k = 0; k < c.setpoints.length; k++) {
    const room = ctx.vmid - TOP_ROOM - (sum - c.setpoints[k]);
    for (let j = 1; SETPOINT_MIN + j * PROBE_VSTEP <= room + 1e-9; j++) {
      const v = Math.round((SETPOINT_MIN + j * PROBE_VSTEP) * 1e4) / 1e4;
      if (Math.abs(v - c.setpoints[k]) < 1e-9) continue;
      const d = copy();
      d.setpoints[k] = v;
      add(d);
    }
  }
  // Setpoint traded between two adjacent devices, their sum kept: the top device's room at mid-span unchanged.
  for (let k = 0; k + 1 < c.setpoints.length; k++) {
    const pair = c.setpoints[k] + c.setpoints[k + 1];
    for (let j = 0; SETPOINT_MIN + j * PROBE_VSTEP <= pair - SETPOINT_MIN + 1e-9; j++) {
      const v = Math.round((SETPOINT_MIN + j * PROBE_VSTEP) * 1e4) / 1e4;
      if (Math.abs(v - c.setpoints[k]) < 1e-9) continue;
      const d = copy();
      d.setpoints[k] = v;
      d.setpoints[k + 1] = pair - v;
      add(d);
    }
  }
  return out;
}

/**
 * A probe with every output device wider than the limit (or not realisable) pulled back, device by device from the
 * bottom, to the highest gm/ID at which it fits (W = I/jd rises with gm/ID at a fixed bias), searched over the whole
 * range below its own; null when a device fits at no allowed gm/ID.
 */
export function toWidthLimit(ctx: SolveContext, c: Candidate): Candidate | null {
  const w0 = candidateWidths(ctx, c);
  if (w0 && !anyWider(w0, ctx.wmax)) return c;
  const d: Candidate = { topology: c.topology, l: c.l, gmid: [...c.gmid], setpoints: c.setpoints };
  const fits = (k: number, g: number): boolean => {
    d.gmid[k] = g;
    const w = candidateWidths(ctx, d);
    return w !== null && w[k] <= ctx.wmax;
  };
  for (let k = 0; k < c.gmid.length; k++) {
    const g = c.gmid[k];
    if (fits(k, g)) continue;
    // The highest grid gm/ID below that fits (scanned down: the lowest ones may not be realisable at all, e.g. a
    // bottom diode's VGS leaving the device above no room), then the edge between it and the next one up.
    let hi = g;
    let lo = NaN;
    for (let j = ctx.gmids.length - 1; j >= 0; j--) {
      if (!(ctx.gmids[j] < hi)) continue;
      if (fits(k, ctx.gmids[j])) {
        lo = ctx.gmids[j];
        break;
      }
      hi = ctx.gmids[j];
    }
    if (Number.isNaN(lo)) return null;
    for (let it = 0; it < EDGE_STEPS; it++) {
      const m = 0.5 * (lo + hi);
      if (fits(k, m)) lo = m;
      else hi = m;
    }
    d.gmid[k] = lo;
  }
  return d;
}
