/**
 * Long-format characterisation CSV for one (kit, device, corner) of the
 * invented "Larkspur Microsystems" demo kits, with the signs a simulator
 * reports: PMOS vgs, vds, vsb and id negative.
 */
import { StackwrightError } from '../errors.js';
import type { Polarity } from '../table/types.js';
import { evalDevice } from './device.js';
import { FOUNDRY, SYNTH_VERSION } from './kits.js';
import { atCorner, type KitDef } from './params.js';
import { lookupKit } from './lookup.js';

export const SYNTH_COLUMNS = ['l', 'w', 'vgs', 'vds', 'vsb', 'id', 'gm', 'gds', 'gmb', 'cgg', 'cgs', 'cgd', 'cdd'] as const;

/**
 * Six significant digits, shortest text: the same string as
 * Number(x.toPrecision(6)).toString(), by trimming zeros (three times faster).
 */
export function fmt6(x: number): string {
  const s = x.toPrecision(6);
  const e = s.indexOf('e');
  // "e+": toString may drop the exponent; subnormals carry fewer than 6 digits. Both are rare: do it the slow way.
  if (e >= 0 && (s.charCodeAt(e + 1) === 43 || Math.abs(x) < 1e-300)) return Number(s).toString();
  let m = e < 0 ? s : s.slice(0, e);
  if (m.indexOf('.') >= 0) {
    let k = m.length;
    while (m.charCodeAt(k - 1) === 48) k--;
    if (m.charCodeAt(k - 1) === 46) k--;
    m = m.slice(0, k);
  }
  return e < 0 ? m : m + s.slice(e);
}

/** Sweep values 0, step, ... up to the supply, in volts (exact from integer mV). */
export function sweepVolts(supply: number, stepMv: number): number[] {
  const top = Math.round(supply * 1000);
  const out: number[] = [];
  for (let mv = 0; mv <= top; mv += stepMv) out.push(mv / 1000);
  return out;
}

export function csvHeaderLines(kit: KitDef, device: Polarity, corner: string): string[] {
  const c = kit.corners[corner];
  return [
    `# INVENTED demonstration data: "${FOUNDRY}" is a fictional foundry; not a real process, do not use for design`,
    `# kit: ${kit.kit}`,
    `# device: ${device === 'n' ? 'n (nmos)' : 'p (pmos)'}`,
    `# corner: ${corner}`,
    `# temperature: ${c.temperature} C`,
    `# generator: stackwright synth v${SYNTH_VERSION} (EKV-style model)`,
    `# units: SI (m, V, A, S, F); signs as a simulator reports${device === 'p' ? ' (pmos: vgs, vds, vsb, id negative)' : ''}`,
  ];
}

/** Uncompressed CSV text; rows ordered l, vgs, vds, vsb (vsb fastest). */
export function synthCsv(kitName: string, device: Polarity, corner: string): string {
  const kit = lookupKit(kitName);
  if (device !== 'n' && device !== 'p') throw new StackwrightError(`device must be n or p, got "${device}"`, { where: 'synth device' });
  const cornerDef = kit.corners[corner];
  if (!cornerDef) {
    throw new StackwrightError(`unknown corner "${corner}" (known: ${Object.keys(kit.corners).join(', ')})`, { where: `synth ${kit.kit}` });
  }
  const p = atCorner(kit.devices[device], cornerDef);
  const sign = device === 'p' ? -1 : 1;
  const vgsAxis = sweepVolts(kit.supply, kit.vgsStepMv);
  const vdsAxis = sweepVolts(kit.supply, kit.vdsStepMv);
  const vsbAxis = kit.vsbMv.map((mv) => mv / 1000);
  const lines = [...csvHeaderLines(kit, device, corner), SYNTH_COLUMNS.join(',')];
  // Axis text is formatted once: it is most of the cells.
  const gText = vgsAxis.map((v) => fmt6(sign * v));
  const dText = vdsAxis.map((v) => fmt6(sign * v));
  const sText = vsbAxis.map((v) => fmt6(sign * v));
  const w = fmt6(kit.w);
  for (const nm of kit.lengthsNm) {
    const l = nm / 1e9;
    const head = `${fmt6(l)},${w},`;
    vgsAxis.forEach((vgs, ig) => {
      vdsAxis.forEach((vds, id) => {
        vsbAxis.forEach((vsb, is) => {
          const v = evalDevice(p, { l, w: kit.w, vgs, vds, vsb });
          lines.push(
            `${head}${gText[ig]},${dText[id]},${sText[is]},${fmt6(sign * v.id)},${fmt6(v.gm)},${fmt6(v.gds)},${fmt6(v.gmb)},` +
              `${fmt6(v.cgg)},${fmt6(v.cgs)},${fmt6(v.cgd)},${fmt6(v.cdd)}`,
          );
        });
      });
    });
  }
  return lines.join('\n') + '\n';
}
