/**
 * kit.json of one invented "Larkspur Microsystems" demo kit: supply, lengths,
 * model parameters, corners and invented Pelgrom coefficients.
 */
import type { Polarity } from '../table/types.js';
import { sweepVolts } from './csv.js';
import { FOUNDRY, SYNTH_VERSION } from './kits.js';
import type { KitDef } from './params.js';

export function csvFileName(device: Polarity, corner: string): string {
  return `${device}-${corner}.csv.gz`;
}

export function kitJson(kit: KitDef): string {
  const devices = (['n', 'p'] as const).map((d) => [d, { type: d === 'n' ? 'nmos' : 'pmos', ...kit.devices[d] }]);
  const doc = {
    kit: kit.kit,
    note: kit.note,
    foundry: `${FOUNDRY} (fictional)`,
    generator: `stackwright synth v${SYNTH_VERSION}`,
    supply: kit.supply,
    lmin: kit.lmin,
    referenceWidth: kit.w,
    lengths: kit.lengthsNm.map((nm) => nm / 1e9),
    sweep: {
      vgs: { from: 0, to: kit.supply, step: kit.vgsStepMv / 1000, points: sweepVolts(kit.supply, kit.vgsStepMv).length },
      vds: { from: 0, to: kit.supply, step: kit.vdsStepMv / 1000, points: sweepVolts(kit.supply, kit.vdsStepMv).length },
      vsb: kit.vsbMv.map((mv) => mv / 1000),
    },
    devices: Object.fromEntries(devices),
    corners: Object.fromEntries(
      Object.entries(kit.corners).map(([name, c]) => [name, { temperature: c.temperature, dvt: c.dvt, muFactor: c.muFactor }]),
    ),
    mismatch: { n: kit.mismatch.n, p: kit.mismatch.p },
    mismatchNote: 'invented Pelgrom coefficients: sigma(dVT) = avt/sqrt(W*L), sigma(dbeta/beta) = abeta/sqrt(W*L)',
    files: Object.fromEntries(
      (['n', 'p'] as const).map((d) => [d, Object.fromEntries(Object.keys(kit.corners).map((c) => [c, csvFileName(d, c)]))]),
    ),
  };
  return JSON.stringify(doc, null, 2) + '\n';
}
