import type { ScreenTools, StageOption, TopologyDescriptor } from './types.js';
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
  screen(t) {
    // Three stages multiply: screen on every other gm/ID value and let refinement fill in.
    const grid = withLowSetpoint(t, t.setpointGrid(0.05));
    const gm = t.gmids.filter((_, j) => j % 2 === 0);
    const bottoms = new Map(grid.map((s1) => [s1, t.prune(t.options({ mode: s1, vsb: 0, gmids: gm, lower: true }), t.crit.bottom)]));
    const picked: StageOption[] = [];
    const finders = new Map([...bottoms].map(([s1, b]) => [s1, new BottomFinder(b, t.mismatch)]));
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
        for (const top of tops) {
          const a3 = 1 + top.gmt * top.ro;
          for (const m of mids) {
            // Rout ≈ a + b·ro_bottom: for this (top, middle) pair each pool wants one bottom, found by binary
            // search among the bottoms sorted by ro, so the work per pair grows with the log of their count.
            const a = top.ro + a3 * m.ro;
            const b = a3 * (1 + m.gmt * m.ro);
            const hr = below + top.vdsat;
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
