import type { LengthSlice, OperatingPoint } from '../../src/device/types.js';

/** An analytic device model per metre of width: [jd, gm/W, gds/W, gmb/W]. Invented parameters, not any real process. */
export type Model = (vgs: number, vds: number, vsb: number) => [number, number, number, number];

/** A LengthSlice from an analytic model, for tests that must not depend on table interpolation. */
export function sliceOf(l: number, model: Model, vsbMax = 1.2): LengthSlice {
  const small = (vgs: number, vds: number, vsb: number, out = new Float64Array(4)) => {
    const r = model(vgs, vds, vsb);
    out[0] = r[0]; out[1] = r[1]; out[2] = r[2]; out[3] = r[3];
    return out;
  };
  return {
    l,
    jd: (vgs, vds, vsb) => model(vgs, vds, vsb)[0],
    small,
    op: (vgs, vds, vsb, w): OperatingPoint => {
      const [jd, gm, gds, gmb] = model(vgs, vds, vsb);
      return {
        l, w, vgs, vds, vsb, id: jd * w, gm: gm * w, gds: gds * w, gmb: gmb * w,
        cgg: NaN, cgs: NaN, cgd: NaN, cdd: NaN, gmid: gm / jd, jd, gain: gm / gds, ft: NaN,
      };
    },
    range: { vgs: [0, 1.8], vds: [0, 1.8], vsb: [0, vsbMax] },
  };
}
