/**
 * The two demo kits of the fictional foundry "Larkspur Microsystems". Every
 * number here is INVENTED for demonstration, of plausible size only; none is
 * taken from any real process.
 */
import type { CornerDef, KitDef } from './params.js';

export const SYNTH_VERSION = 1;
export const FOUNDRY = 'Larkspur Microsystems';
export const INVENTED_NOTE =
  'invented demonstration data: "Larkspur Microsystems" is a fictional foundry; not a real process, do not use for design';

const CORNERS_180: Record<string, CornerDef> = {
  tt: { temperature: 27, dvt: 0, muFactor: 1 },
  ss: { temperature: 125, dvt: 0.06, muFactor: 0.72 },
  ff: { temperature: -40, dvt: -0.06, muFactor: 1.3 },
};

const CORNERS_090: Record<string, CornerDef> = {
  tt: { temperature: 27, dvt: 0, muFactor: 1 },
  ss: { temperature: 125, dvt: 0.05, muFactor: 0.74 },
  ff: { temperature: -40, dvt: -0.05, muFactor: 1.28 },
};

const demo180: KitDef = {
  kit: 'demo180',
  note: `${INVENTED_NOTE}; 1.8 V, 0.18 µm-class`,
  supply: 1.8,
  lmin: 180e-9,
  lengthsNm: [180, 250, 350, 500, 700, 1000, 1400, 2000],
  vgsStepMv: 50,
  vdsStepMv: 50,
  vsbMv: [0, 300, 600, 900],
  w: 1e-6,
  devices: {
    n: {
      vt0: 0.45, gamma: 0.5, phi: 0.85, mu0: 0.038, tox: 4.0e-9, theta: 0.3, vsat: 1.0e5,
      dibl: 0.035, lmin: 180e-9, vaPerLength: 25e6, cov: 0.35e-9, cj: 1.0e-9, pb: 0.8, mj: 0.4,
    },
    p: {
      vt0: 0.5, gamma: 0.45, phi: 0.8, mu0: 0.0105, tox: 4.2e-9, theta: 0.2, vsat: 0.8e5,
      dibl: 0.03, lmin: 180e-9, vaPerLength: 22e6, cov: 0.35e-9, cj: 1.1e-9, pb: 0.8, mj: 0.4,
    },
  },
  corners: CORNERS_180,
  mismatch: {
    n: { avt_mV_um: 5, abeta_pct_um: 1 },
    p: { avt_mV_um: 4.5, abeta_pct_um: 1.2 },
  },
};

// Thinner oxide, lower VT, stronger DIBL and velocity saturation, shorter Early voltage.
const demo090: KitDef = {
  kit: 'demo090',
  note: `${INVENTED_NOTE}; 1.2 V, 90 nm-class`,
  supply: 1.2,
  lmin: 90e-9,
  lengthsNm: [90, 120, 160, 220, 300, 400, 550, 750, 1000],
  vgsStepMv: 40,
  vdsStepMv: 40,
  vsbMv: [0, 200, 400, 600],
  w: 1e-6,
  devices: {
    n: {
      vt0: 0.35, gamma: 0.35, phi: 0.9, mu0: 0.032, tox: 2.2e-9, theta: 0.5, vsat: 1.0e5,
      dibl: 0.09, lmin: 90e-9, vaPerLength: 14e6, cov: 0.3e-9, cj: 0.8e-9, pb: 0.75, mj: 0.4,
    },
    p: {
      vt0: 0.37, gamma: 0.3, phi: 0.85, mu0: 0.009, tox: 2.4e-9, theta: 0.35, vsat: 0.7e5,
      dibl: 0.08, lmin: 90e-9, vaPerLength: 12e6, cov: 0.3e-9, cj: 0.9e-9, pb: 0.75, mj: 0.4,
    },
  },
  corners: CORNERS_090,
  mismatch: {
    n: { avt_mV_um: 3.5, abeta_pct_um: 1 },
    p: { avt_mV_um: 3.2, abeta_pct_um: 1.1 },
  },
};

export const DEMO_KITS: Readonly<Record<string, KitDef>> = { demo180, demo090 };
export const DEMO_KIT_NAMES: readonly string[] = Object.keys(DEMO_KITS);
