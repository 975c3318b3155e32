import { squeezedSetpoint, type ScreenTools, type StageOption, type TopologyDescriptor } from './types.js';
import { BottomFinder } from './bottom-finder.js';

/**
 * The coarse triple grid can step over the narrow band where lower devices are just
 * saturated (VDSsat ≥ 4·UT at any inversion, 4.5·UT at 80 % of the gm/ID ceiling by the
 * EKV relations): add that setpoint, on the 25 mV grid, when it lies inside.
 */
function withLowSetpoint(t: ScreenTools, grid: number[]): number[] {
  const low = Math.ceil((4.5 * t.ut) / 0.025 - 1e-9) * 0.025;
  if (grid.length === 0 || low > grid[grid.length - 1] || grid.some((g) => Math.abs(g - low) < 1e-9)) return grid;
  return [...grid, Math.round(low * 1e6) / 1e6].sort((a, b) => a - b);
}

/**
 * Every other gm/ID grid value from the lowest, the last of them moved up to the highest (as many values as every
 * other one): the highest allowed gm/ID is where the lowest headroom and the highest Rout often sit, all three devices
 * there with setpoints to match, and a climb from the value below reaches it only with the setpoints moved too.
 */
function everyOther(gmids: readonly number[]): number[] {
  const last = gmids.length - 1;
  return gmids.filter((_, j) => j === 0 || (j % 2 === 0 && j + 1 < last) || j === last);
}

/**
 * Best case of a group of lower devices (each taken over the group): largest ro
 * and gmt·ro, smallest area and σ; `positive` when every ro and gmt is (then
 * Rout grows with each, so the best case bounds every member).
 */
function groupBounds(options: readonly StageOption[]): { ro: number; gain: number; area: number; sigma: number; positive: boolean } {
  let ro = -Infinity;
  let gain = -Infinity;
  let area = Infinity;
  let sigma = Infinity;
  let positive = true;
  for (let j = 0; j < options.length; j++) {
    const o = options[j];
    if (!(o.ro >= 0 && o.gmt >= 0)) positive = false;
    if (o.ro > ro) ro = o.ro;
    const g = o.gmt * o.ro;
    if (g > gain) gain = g;
    if (o.area < area) area = o.area;
    if (o.sigma < sigma) sigma = o.sigma;
  }
  return { ro, gain, area, sigma, positive };
}

/** Three devices with low-voltage biasing: two VDS setpoints below the top device. */
export const triple: TopologyDescriptor = {
  name: 'triple',
  roles: ['bottom', 'middle', 'top'],
  setpoints: 2,
  bottomDiode: false,
  stackedBias: false,
  // 3·Vov (common practice).
  ruleOfThumbHeadroom: (vov) => vov[0] + vov[1] + vov[2],
  refineVoltageStep: 0.025,
  otherBias(c, vmid, gmidLow) {
    // The middle takes all but the squeezed top's room of mid-span (squeezedSetpoint): the top leaves saturation first
    // and the middle gives up its spare VDS, so the headroom can sit far below s1 + s2 + VDSsat3, where the screen's
    // estimate (and so its setpoint grid) never goes. The climb takes it from there.
    const s2 = squeezedSetpoint(vmid, c.setpoints[0], c.setpoints[1], 0.025);
    if (s2 === null) return [];
    const setpoints = [c.setpoints[0], s2];
    // Also with the top at the lowest gm/ID: squeezed, it carries the current in triode and gives no gain, so the
    // strongest inversion (the narrowest device) may serve.
    const out = [{ topology: c.topology, l: c.l, gmid: c.gmid, setpoints }];
    if (c.gmid[2] > gmidLow + 1e-9) out.push({ topology: c.topology, l: c.l, gmid: [c.gmid[0], c.gmid[1], gmidLow], setpoints });
    return out;
  },
  screen(t) {
    // Three stages multiply: screen on every other gm/ID value and let refinement fill in.
    const grid = withLowSetpoint(t, t.setpointGrid(0.05));
    const gm = everyOther(t.gmids);
    const bottoms = new Map(grid.map((s1) => [s1, t.prune(t.options({ mode: s1, vsb: 0, gmids: gm, lower: true }), t.crit.bottom)]));
    const picked: StageOption[] = [];
    const finders = new Map([...bottoms].map(([s1, b]) => [s1, new BottomFinder(b, t.mismatch)]));
    const bottomBounds = new Map([...bottoms].map(([s1, b]) => [s1, groupBounds(b)]));
    for (const s1 of grid) {
      for (const s2 of grid) {
        const below = Math.round((s1 + s2) * 1e6) / 1e6;
        // The top device needs room for its own saturation voltage (≥ 4·UT).
        if (below > Math.max(grid[grid.length - 1] - 0.05, grid[0]) + 1e-9) continue;
        const bottom = bottoms.get(s1)!;
        if (bottom.length === 0) continue;
        const mids = t.prune(t.options({ mode: s2, vsb: s1, gmids: gm, lower: true }), t.crit.mid);
        if (mids.length === 0) continue;
        const tops = t.top(below, gm);
        const find = finders.get(s1)!;
        const mb = groupBounds(mids);
        const bb = bottomBounds.get(s1)!;
        // The bound needs every term non-negative (then Rout grows with each of them).
        const bounded = mb.positive && bb.positive;
        for (let i = 0; i < tops.length; i++) {
          const top = tops[i];
          const a3 = 1 + top.gmt * top.ro;
          if (bounded && top.ro >= 0 && a3 >= 1) {
            // Best case of the top's mids × bottoms: when it cannot enter a pool, none of them can (every key is monotone).
            const best = top.ro + a3 * mb.ro + a3 * (1 + mb.gain) * bb.ro;
            if (Number.isFinite(best) && !t.mayWant(mids.length * bottom.length, bb.area + mb.area + top.area, best, below + top.vdsat, bb.sigma)) continue;
          }
          for (let q = 0; q < mids.length; q++) {
            const m = mids[q];
            // Rout ≈ a + b·ro_bottom: for this (top, middle) pair each pool wants one bottom, found by binary
            // search among the bottoms sorted by ro, so the work per pair grows with the log of their count.
            const a = top.ro + a3 * m.ro;
            const b = a3 * (1 + m.gmt * m.ro);
            const hr = below + top.vdsat;
            // The same bound for this pair's bottoms.
            const best = a + b * bb.ro;
            if (bounded && Number.isFinite(best) && !t.mayWant(bottom.length, bb.area + m.area + top.area, best, hr, bb.sigma)) continue;
            const count = find.picks((t.rout - a) / b, (2 * t.rout - a) / b, picked);
            t.covered(bottom.length - count);
            for (let j = 0; j < count; j++) {
              const o = picked[j];
              if (t.wants(o.area + m.area + top.area, a + b * o.ro, hr, o.sigma)) t.keep([o.l, m.l, top.l], [o.gmid, m.gmid, top.gmid], [s1, s2]);
            }
          }
        }
      }
    }
  },
};
