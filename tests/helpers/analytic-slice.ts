import type { LengthSlice, OperatingPoint } from '../../src/device/types.js';
import { coveredEdges } from '../../src/numeric/axis.js';

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
    edges: coveredEdges([0, 1.8], [0, 1.8], [0, vsbMax]),
  };
}

/**
 * EKV-style smooth model, bulk-referenced (Enz, Krummenacher & Vittoz, 1995; from memory):
 * ID = IS·[F(uf) − F(ur)]·(1+λVDS), F(u) = ln²(1+e^{u/2}), uf = (VP−VS)/UT, ur = (VP−VD)/UT,
 * VP = (VG−VT0)/n, IS = 2nβUT²; hence gmb = (n−1)·gm. Derivatives analytic.
 */
export function ekv(p: { l: number; vt0: number; kp: number; n: number; lambda: number }): Model {
  const ut = 0.02585;
  const is = (2 * p.n * p.kp * ut * ut) / p.l;
  const lg = (u: number) => (u > 60 ? u / 2 : Math.log1p(Math.exp(u / 2)));
  const sig = (u: number) => 1 / (1 + Math.exp(-u / 2));
  return (vgs, vds, vsb) => {
    const vp = (vgs + vsb - p.vt0) / p.n;
    const uf = (vp - vsb) / ut;
    const ur = (vp - vsb - vds) / ut;
    const lf = lg(uf);
    const lr = lg(ur);
    const dF = lf * sig(uf); // F'(uf)
    const dR = lr * sig(ur);
    const clm = 1 + p.lambda * vds;
    const core = is * (lf * lf - lr * lr);
    const gm = (is * (dF - dR) * clm) / (p.n * ut);
    return [core * clm, gm, (is * dR * clm) / ut + core * p.lambda, (p.n - 1) * gm];
  };
}
