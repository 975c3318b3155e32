import type { SolveContext } from '../context.js';
import type { Candidate } from './candidate.js';
import { toWidthLimit } from './width-edge.js';

// Setpoint spacing of the probes, V: finer than the ridges seen in Rout at a headroom target where no device is
// saturated (a few tens of mV wide), coarse enough to stay a few dozen probes per setpoint.
const PROBE_VSTEP = 0.05;
// Lowest setpoint (as the climb's moves) and the room the top device keeps at mid-span, V.
const SETPOINT_MIN = 0.02;
const TOP_ROOM = 0.02;

/**
 * Long moves from a design: each coordinate alone over its whole allowed range (each length over the allowed lengths,
 * each gm/ID on the search's grid, each setpoint every PROBE_VSTEP up to mid-span, and the setpoint traded between
 * adjacent devices), the rest kept. A climb only ever steps to neighbours, so a figure with several far-apart maxima
 * over one coordinate (Rout at a headroom target where nothing is saturated has them: at a lower device's saturation
 * edge and again well above it) keeps it on the first one it reaches. Also each length with each setpoint (the two
 * together, where neither alone gains). Probes wider than the width limit are pulled back to it (see toWidthLimit).
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
  const gHi = ctx.gmids[ctx.gmids.length - 1];
  for (let k = 0; k < c.l.length; k++) {
    for (const l of ctx.lengths) {
      if (Math.abs(l - c.l[k]) < 1e-15) continue;
      const d = copy();
      d.l = [...c.l];
      d.l[k] = l;
      add(d);
      // And the device at its widest: where the width limit binds, the best designs keep each device on it, so a
      // new length is worth most with the gm/ID that brings the device back to the limit (toWidthLimit pulls it there).
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
  // A length with each setpoint: a device's best VDS moves with its length (a shorter one saturates at a lower VDS,
  // a longer one needs the room), so where the width limit holds both devices a new length alone, or a setpoint
  // alone, can fall short where the two together do not.
  for (let k = 0; k < c.l.length; k++) {
    for (const l of ctx.lengths) {
      if (Math.abs(l - c.l[k]) < 1e-15) continue;
      for (let m = 0; m < c.setpoints.length; m++) {
        const room = ctx.vmid - TOP_ROOM - (sum - c.setpoints[m]);
        for (let j = 1; SETPOINT_MIN + j * PROBE_VSTEP <= room + 1e-9; j++) {
          const v = Math.round((SETPOINT_MIN + j * PROBE_VSTEP) * 1e4) / 1e4;
          if (Math.abs(v - c.setpoints[m]) < 1e-9) continue;
          const d = copy();
          d.l = [...c.l];
          d.l[k] = l;
          d.setpoints[m] = v;
          add(d);
          // And every device at its widest, pulled back to the limit: the new VDS of each changes the gm/ID that fits.
          const e = copy();
          e.l = d.l;
          e.setpoints = d.setpoints;
          for (let i = 0; i < e.gmid.length; i++) e.gmid[i] = gHi;
          add(e);
        }
      }
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

