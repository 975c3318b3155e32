import { squeezedSetpoint, type TopologyDescriptor } from './types.js';
import { bounds } from './bounds.js';
import { runsOf } from './runs.js';

// The screen's setpoint step, V.
const SETPOINT_STEP = 0.025;

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
  otherBias(c, vmid) {
    // The bottom takes all but the squeezed top's room of mid-span (squeezedSetpoint): its drain follows the top down
    // as the output falls to the headroom target, so a long bottom alone can carry the Rout target with its setpoint far
    // above the target, where the screen's estimate (s1 + VDSsat2) and its setpoint grid never go.
    const s1 = squeezedSetpoint(vmid, 0, c.setpoints[0], SETPOINT_STEP);
    return s1 === null ? [] : [{ topology: c.topology, l: c.l, gmid: c.gmid, setpoints: [s1] }];
  },
  screen(t) {
    for (const s1 of t.setpointGrid(SETPOINT_STEP)) {
      const bottom = t.prune(t.options({ mode: s1, vsb: 0, lower: true }), t.crit.bottom);
      if (bottom.length === 0) continue;
      const b = bounds(bottom);
      // Runs of one length, at most 8 long: rates least on the demo specs.
      const runs = runsOf(bottom, 8, true);
      const tops = t.top(s1);
      for (let i = 0; i < tops.length; i++) {
        const top = tops[i];
        const a = top.ro;
        const g = 1 + top.gmt * top.ro;
        const hr = s1 + top.vdsat;
        // Rout grows with ro_bottom and every pool key is monotone: when the best-case bottom cannot enter, none can
        // (an infinite bound would be refused for not being finite, so it proves nothing).
        const best = a + g * b.ro;
        if (Number.isFinite(best) && !t.mayWant(bottom.length, b.area + top.area, best, hr, b.sigma)) continue;
        for (let q = 0; q < runs.length; q++) {
          const r = runs[q];
          // The same bound per run of one length (Rout grows with ro_bottom only when g is not negative).
          const bestRun = a + g * r.ro;
          if (runs.length > 1 && g >= 0 && Number.isFinite(bestRun) && !t.mayWant(r.end - r.start, r.area + top.area, bestRun, hr, r.sigma)) continue;
          for (let j = r.start; j < r.end; j++) {
            const o = bottom[j];
            if (t.wants(o.area + top.area, a + g * o.ro, hr, o.sigma)) t.keep([o.l, top.l], [o.gmid, top.gmid], [s1]);
          }
        }
      }
    }
  },
};
