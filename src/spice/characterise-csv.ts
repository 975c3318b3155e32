import { StackwrightError } from '../errors.js';
import { CHAR_COLUMNS, PER_DEVICE, dataFileName, type CharacterisationOptions } from './characterise.js';
import { parseWrdata } from './wrdata.js';

/**
 * Turn the wrdata files of a characterisation run into long-format CSV
 * (header CHAR_COLUMNS, SI units, simulator signs: PMOS vgs/vds/vsb/id < 0).
 * Capacitances are the BSIM4 intrinsic ones as ngspice reports them in DC,
 * turned into positive capacitances: cgs = -dQg/dVs, cgd = -dQg/dVd, cdd = dQd/dVd.
 */
export function characterisationCsv(files: Record<string, string>, opts: CharacterisationOptions): string {
  const out: string[] = [CHAR_COLUMNS.join(',')];
  const nq = PER_DEVICE.length;
  opts.vsb.forEach((_, i) => {
    const name = dataFileName(i);
    const text = files[name];
    if (text === undefined) throw new StackwrightError('ngspice did not write this file', { where: name });
    const table = parseWrdata(text, name);
    const expected = 1 + 3 + nq * opts.lengths.length;
    if (table.names.length !== expected) {
      throw new StackwrightError(`expected ${expected} columns, found ${table.names.length}`, { where: name });
    }
    for (const row of table.rows) {
      const vgs = snap(row[1]);
      const vds = snap(row[2]);
      const vsb = snap(-row[3]);
      opts.lengths.forEach((l, k) => {
        const b = 4 + k * nq;
        const [id, gm, gds, gmb, cgg, cgs, cgd, cdd] = row.slice(b, b + nq);
        const cells = [l, opts.w, vgs, vds, vsb, id, gm, gds, gmb, cgg, -cgs, -cgd, cdd];
        out.push(cells.map(fmt).join(','));
      });
    }
  });
  return out.join('\n') + '\n';
}

// ngspice accumulates sweep values; snap voltages to the nV grid so table axes match.
function snap(v: number): number {
  const r = Math.round(v * 1e9) / 1e9;
  return Object.is(r, -0) ? 0 : r;
}

function fmt(x: number): string {
  return Number(x.toPrecision(10)).toString();
}
