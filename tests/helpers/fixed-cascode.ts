// A throwaway topology for tests, written and registered in this one file: a cascode whose bottom drain is held at
// one fixed VDS setpoint (0.25 V) instead of the search choosing it. Invented for tests; not shipped.
import { registerTopology, topologyNames, topologyOf, type TopologyDescriptor } from '../../src/topology/index.js';

export const FIXED_VDS = 0.25;

// Shape, biasing and rule of thumb as the cascode's (a spread copy); only the name and the screen differ.
export const fixedCascode: TopologyDescriptor = {
  ...topologyOf('cascode'),
  name: 'fixed-cascode',
  screen(t) {
    const bottom = t.prune(t.options({ mode: FIXED_VDS, vsb: 0, lower: true }), t.crit.bottom);
    for (const top of t.top(FIXED_VDS)) {
      for (const o of bottom) {
        const rout = top.ro + (1 + top.gmt * top.ro) * o.ro;
        if (t.wants(o.area + top.area, rout, FIXED_VDS + top.vdsat, o.sigma)) t.keep([o.l, top.l], [o.gmid, top.gmid], [FIXED_VDS]);
      }
    }
  },
};

if (!topologyNames().includes(fixedCascode.name)) registerTopology(fixedCascode);
