import { noOtherBias, type TopologyDescriptor } from './types.js';

/** One device: the plain current source/sink. */
export const single: TopologyDescriptor = {
  name: 'single',
  roles: ['bottom'],
  setpoints: 0,
  bottomDiode: false,
  stackedBias: false,
  // Headroom is the device's Vov (common practice).
  ruleOfThumbHeadroom: (vov) => vov[0],
  refineVoltageStep: 0.0125,
  otherBias: noOtherBias,
  screen(t) {
    const options = t.options({ mode: t.vmid, vsb: 0, smallAt: t.topVds(0) });
    for (let j = 0; j < options.length; j++) {
      const o = options[j];
      if (t.wants(o.area, o.ro, o.vdsat, o.sigma)) t.keep([o.l], [o.gmid], []);
    }
  },
};
