import { noOtherBias, type StageOption, type TopologyDescriptor } from './types.js';
import { bounds } from './bounds.js';
import { runsOf } from './runs.js';

/** Two devices biased by stacked diodes: the bottom device's VDS equals its VGS. */
export const cascodeStacked: TopologyDescriptor = {
  name: 'cascode-stacked',
  roles: ['bottom', 'top'],
  setpoints: 0,
  bottomDiode: true,
  stackedBias: true,
  // VGS + Vov (common practice).
  ruleOfThumbHeadroom: (vov, vgs) => vgs[0] + vov[1],
  refineVoltageStep: 0.0125,
  otherBias: noOtherBias,
  screen(t) {
    // The bottom diode sets x1 = VGS1; group bottoms by x1 (25 mV) so top options (and their sweeps) are shared.
    const groups = new Map<number, StageOption[]>();
    for (const o of t.prune(t.options({ mode: 'diode', vsb: 0, lower: true }), t.crit.diode)) {
      const x1 = Math.round(o.vgs * 40) / 40;
      if (!groups.has(x1)) groups.set(x1, []);
      groups.get(x1)!.push(o);
    }
    for (const [x1, bottom] of groups) {
      if (x1 >= t.vmid - 0.05) continue;
      const bb = bounds(bottom);
      // Runs of 4 in list order (a group mixes lengths): rates least on the demo specs.
      const runs = runsOf(bottom, 4, false);
      const tops = t.top(x1);
      // The bottom's VDS at the headroom target: what the top's VDS there (t.topVds) leaves it. Below VGS1 the top is
      // squeezed out of saturation as the output falls to the target, and the bottom's drain follows it down.
      const room = t.headroom - t.topVds(x1);
      for (let i = 0; i < tops.length; i++) {
        const top = tops[i];
        const a = top.ro;
        const b = 1 + top.gmt * top.ro;
        // Headroom estimate: VGS1 + VDSsat2, or the target itself where the Rout estimate (the top taken at the VDS it
        // keeps there) meets its target and the bottom stays saturated: where that Rout holds, so does the headroom.
        // A Rout well above its target holds with the top far below its VDSsat (audit3 A3-9: VGS1 + VDSsat2 0.61 V,
        // headroom 0.47 V, Rout 10 times its target), and a squeezed top (below VGS1) holds it with the bottom's drain
        // pulled down: the bottom's VDSsat is a fraction of its VGS, so a bottom of high VGS (a long one at low gm/ID:
        // little area for a mismatch budget) can serve a headroom target far below VGS1 + VDSsat2.
        const hrOf = (o: StageOption, rout: number) => (rout >= t.rout && o.sat <= room ? Math.min(o.vgs + top.vdsat, t.headroom) : o.vgs + top.vdsat);
        // A bound over a group whose Rout is at most `rout`: members meeting the Rout target may sit at the target.
        const hrBound = (vgs: number, rout: number) => (rout >= t.rout ? Math.min(vgs + top.vdsat, t.headroom) : vgs + top.vdsat);
        // As for the cascode: skip the group when its best case (lowest VGS for the headroom) cannot enter a pool.
        const best = a + b * bb.ro;
        if (Number.isFinite(best) && !t.mayWant(bottom.length, bb.area + top.area, best, hrBound(bb.vgs, best), bb.sigma)) continue;
        for (let q = 0; q < runs.length; q++) {
          const r = runs[q];
          // The same bound per run (Rout grows with ro_bottom only when b is not negative).
          const bestRun = a + b * r.ro;
          if (runs.length > 1 && b >= 0 && Number.isFinite(bestRun) && !t.mayWant(r.end - r.start, r.area + top.area, bestRun, hrBound(r.vgs, bestRun), r.sigma)) continue;
          for (let j = r.start; j < r.end; j++) {
            const o = bottom[j];
            const rout = a + b * o.ro;
            if (t.wants(o.area + top.area, rout, hrOf(o, rout), o.sigma)) t.keep([o.l, top.l], [o.gmid, top.gmid], []);
          }
        }
      }
    }
  },
};
