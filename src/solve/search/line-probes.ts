import type { SolveContext } from '../context.js';
import { SETPOINT_MIN, type Candidate } from './candidate.js';
import { toWidthLimit, widestAt } from './width-edge.js';
import { saturationVoltage } from '../../stack/index.js';

// Setpoint spacing of the probes, V: finer than the ridges seen in Rout at a headroom target where no device is
// saturated (a few tens of mV wide), coarse enough to stay a few dozen probes per setpoint.
const PROBE_VSTEP = 0.05;
// The room the top device keeps at mid-span, V.
const TOP_ROOM = 0.02;
// Bisection steps towards the edge of a setpoint line's realisable stretch (50 mV / 2^6: under 1 mV). Rout at the
// headroom target can peak right at that edge (a lower device at its saturation edge, or a device at the highest gm/ID
// its bias reaches), between two probes, one of them not realisable.
const LINE_EDGE_STEPS = 6;
// Bisection steps of a lower device's saturation edge over the gm/ID range, and the slack it keeps there, V (the
// mid-span solve's VDSsat is at its own gm/ID, a hair from the design's).
const SAT_STEPS = 12;
const SAT_SLACK = 0.002;

/** The highest value setpoint k can take with the others as they are: all of mid-span but the top's TOP_ROOM, V. */
export function setpointRoom(ctx: SolveContext, setpoints: readonly number[], k: number): number {
  const sum = setpoints.reduce((a, b) => a + b, 0);
  return ctx.vmid - TOP_ROOM - (sum - setpoints[k]);
}

/**
 * Long moves from a design: each coordinate alone over its whole allowed range (each length over the allowed lengths,
 * each gm/ID on the search's grid, each setpoint every PROBE_VSTEP up to mid-span, and the setpoint traded between
 * adjacent devices), the rest kept. A climb only ever steps to neighbours, so a figure with several far-apart maxima
 * over one coordinate (Rout at a headroom target where nothing is saturated has them: at a lower device's saturation
 * edge and again well above it) keeps it on the first one it reaches. Also each length with each setpoint, and each
 * length with each adjacent pair of setpoints traded (the two together, where neither alone gains). Probes wider than the width limit are pulled back to it (see toWidthLimit).
 * With `realisable` (the caller's judgement of a probe), each setpoint line also gets the points at the edges of its
 * realisable stretches.
 */
export function lineProbes(ctx: SolveContext, c: Candidate, realisable?: (d: Candidate) => boolean, saturationEdges = false): Candidate[] {
  const out: Candidate[] = [];
  // The probe, pulled to the width limit when too wide; 'pulled' when it was (null: it fits nowhere).
  const add = (d: Candidate): 'fits' | 'pulled' | null => {
    const f = toWidthLimit(ctx, d);
    if (f) out.push(f);
    return f === null ? null : f === d ? 'fits' : 'pulled';
  };
  const copy = (): Candidate => ({ topology: c.topology, l: c.l, gmid: [...c.gmid], setpoints: [...c.setpoints] });
  const gHi = ctx.gmids[ctx.gmids.length - 1];
  const widest = (d: Candidate, keep = -1): Candidate | null => widestAt(ctx, d, keep);
  // The lowest gm/ID at which device k, its VDS at `v` and its source at `vsb`, is saturated (VDSsat falls as gm/ID
  // rises; null: not at any allowed one).
  const ut = ctx.ut(ctx.nominal);
  const satEdge = (l: number, v: number, vsb: number): number | null => {
    const slice = ctx.slice(ctx.nominal, l);
    const sat = (g: number) => saturationVoltage(slice, g, vsb, ut) <= v - SAT_SLACK;
    let lo = ctx.gmids[0];
    let hi = gHi;
    if (sat(lo)) return lo;
    if (!sat(hi)) return null;
    for (let it = 0; it < SAT_STEPS; it++) {
      const m = 0.5 * (lo + hi);
      if (sat(m)) hi = m;
      else lo = m;
    }
    return hi;
  };
  // One line of setpoint probes: `at(v)` for each grid value v, made to fit by `fit` (the design itself, at `own`,
  // not probed again), and with `realisable`, the last realisable point next to each end of the line's realisable
  // stretches (see LINE_EDGE_STEPS).
  const line = (own: number, values: number[], at: (v: number) => Candidate, fit: (d: Candidate) => Candidate | null = (d) => toWidthLimit(ctx, d)) => {
    const vs = (Number.isNaN(own) ? [...values] : [...values.filter((v) => Math.abs(v - own) >= 1e-9), own]).sort((a, b) => a - b);
    const ok = vs.map((v) => {
      if (v === own) return true;
      const f = fit(at(v));
      if (f) out.push(f);
      return f !== null && (realisable === undefined || realisable(f));
    });
    if (realisable === undefined) return;
    for (let j = 0; j + 1 < vs.length; j++) {
      if (ok[j] === ok[j + 1]) continue;
      let good = ok[j] ? vs[j] : vs[j + 1];
      let bad = ok[j] ? vs[j + 1] : vs[j];
      let edge: Candidate | null = null;
      for (let it = 0; it < LINE_EDGE_STEPS; it++) {
        const m = Math.round(0.5 * (good + bad) * 1e4) / 1e4;
        const f = fit(at(m));
        if (f !== null && realisable(f)) {
          good = m;
          edge = f;
        } else bad = m;
      }
      if (edge) out.push(edge);
    }
  };
  const grid = (top: number, from: number): number[] => {
    const vs: number[] = [];
    for (let j = from; SETPOINT_MIN + j * PROBE_VSTEP <= top + 1e-9; j++) vs.push(Math.round((SETPOINT_MIN + j * PROBE_VSTEP) * 1e4) / 1e4);
    return vs;
  };
  // Each other allowed length of each device k: the design's lengths with that one changed (shared by the probes below).
  const moved: Array<{ k: number; l: number[] }> = [];
  for (let k = 0; k < c.l.length; k++) {
    for (const l of ctx.lengths) {
      if (Math.abs(l - c.l[k]) < 1e-15) continue;
      const ls = [...c.l];
      ls[k] = l;
      moved.push({ k, l: ls });
    }
  }
  for (const { k, l } of moved) {
    const d = copy();
    d.l = l;
    add(d);
    // And the device at its widest: where the width limit binds, the best designs keep each device on it, so a
    // new length is worth most with the gm/ID that brings the device back to the limit (toWidthLimit pulls it there).
    if (c.gmid[k] < gHi - 1e-9) {
      const e = copy();
      e.l = l;
      e.gmid[k] = gHi;
      add(e);
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
  for (let k = 0; k < c.setpoints.length; k++) {
    const room = setpointRoom(ctx, c.setpoints, k);
    line(c.setpoints[k], grid(room, 1), (v) => {
      const d = copy();
      d.setpoints[k] = v;
      return d;
    });
  }
  // With `saturationEdges`, each setpoint with its device at its saturation edge and the others at their widest: where
  // nothing is saturated at the headroom target, Rout there can peak with a lower device at a low gm/ID just saturated at mid-span (a high VDS
  // bought with its overdrive) under a wide device at a high gm/ID, three coordinates away from a design elsewhere.
  for (let m = 0; saturationEdges && m < c.setpoints.length; m++) {
    const room = setpointRoom(ctx, c.setpoints, m);
    let vsb = 0;
    for (let j = 0; j < m; j++) vsb += c.setpoints[j];
    line(NaN, grid(room, 1), (v) => {
      const d = copy();
      d.setpoints[m] = v;
      d.gmid[m] = satEdge(c.l[m], v, vsb) ?? gHi;
      return d;
    }, (d) => widest(d, m));
    // And each other length at the design's own setpoint.
    const v = c.setpoints[m];
    for (const { l } of moved) {
      const d = copy();
      d.l = l;
      d.gmid[m] = satEdge(l[m], v, vsb) ?? gHi;
      const f = widest(d, m);
      if (f) out.push(f);
    }
  }
  // A length with each setpoint: a device's best VDS moves with its length (a shorter one saturates at a lower VDS,
  // a longer one needs the room), so where the width limit holds both devices a new length alone, or a setpoint
  // alone, can fall short where the two together do not.
  for (const { l } of moved) {
    for (let m = 0; m < c.setpoints.length; m++) {
      const room = setpointRoom(ctx, c.setpoints, m);
      const at = (v: number): Candidate => {
        const d = copy();
        d.l = l;
        d.setpoints[m] = v;
        return d;
      };
      // The design's own setpoint too: at the new length it is a probe like the others.
      const values = grid(room, 1);
      if (!values.some((v) => Math.abs(v - c.setpoints[m]) < 1e-9)) values.push(c.setpoints[m]);
      line(NaN, values, at);
      // And every device at its widest, pulled back to the limit: the new VDS of each changes the gm/ID that fits.
      line(NaN, values, at, widest);
    }
  }
  // A length with a traded pair: a new length moves its device's best VDS, and with the pair's sum kept the top device
  // keeps its room (with a tight width limit, the top device at its lowest gm/ID leaves no room to give up).
  for (const { l } of moved) {
    for (let m = 0; m + 1 < c.setpoints.length; m++) {
      const pair = c.setpoints[m] + c.setpoints[m + 1];
      const at = (v: number): Candidate => {
        const d = copy();
        d.l = l;
        d.setpoints[m] = v;
        d.setpoints[m + 1] = pair - v;
        return d;
      };
      line(NaN, grid(pair - SETPOINT_MIN, 0), at);
      line(NaN, grid(pair - SETPOINT_MIN, 0), at, widest);
    }
  }
  // Setpoint traded between two adjacent devices, their sum kept: the top device's room at mid-span unchanged.
  for (let k = 0; k + 1 < c.setpoints.length; k++) {
    const pair = c.setpoints[k] + c.setpoints[k + 1];
    line(c.setpoints[k], grid(pair - SETPOINT_MIN, 0), (v) => {
      const d = copy();
      d.setpoints[k] = v;
      d.setpoints[k + 1] = pair - v;
      return d;
    });
  }
  return out;
}

