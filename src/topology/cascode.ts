import type { TopologyDescriptor } from './types.js';

/** Two devices with low-voltage biasing: the bottom drain sits at a chosen VDS setpoint. */
export const cascode: TopologyDescriptor = {
  name: 'cascode',
  roles: ['bottom', 'top'],
  setpoints: 1,
  bottomDiode: false,
  stackedBias: false,
  // 2·Vov (common practice).
  ruleOfThumbHeadroom: (vov) => vov[0] + vov[1],
  refineVoltageStep: 0.0125,
  screen(t) {
    for (const s1 of t.setpointGrid(0.025)) {
      const bottom = t.prune(t.options({ mode: s1, vsb: 0, lower: true }), t.crit.bottom);
      if (bottom.length === 0) continue;
      for (const top of t.top(s1)) {
        const a = top.ro;
        const b = 1 + top.gmt * top.ro;
        for (const o of bottom) {
          if (t.wants(o.area + top.area, a + b * o.ro, s1 + top.vdsat, o.sigma)) t.keep([o.l, top.l], [o.gmid, top.gmid], [s1]);
        }
      }
    }
  },
};
