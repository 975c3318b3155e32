/**
 * Independent small-signal reference for a gain stage: the deck `netlist --stage --bias diodes` writes (src/spice
 * stageNetlist), run as a plain ngspice job with no holding loop. The input DC source is set (by two DC sweeps of the
 * input) so that the output sits at the design point, the load capacitance is put on the output, and
 *  - an AC analysis gives |v(out)/v(inp)| (the input source carries `ac 1`), whose first fall through 1 is the
 *    unity-gain frequency, interpolated log-log by this helper's own code;
 *  - the operating point printout gives gm of the input device and the capacitances ngspice's BSIM4 reports on the
 *    output node (cdd and capbd of the two output devices), for the single-pole relation GBW = gm / (2π C_total).
 * Nothing here uses the confirm code (src/confirm).
 */
import type { StageResult } from '../../src/solve/stage-types.js';
import { runNgspice, simulateStage, stageNetlist } from '../../src/spice/index.js';
import { parseWrdata } from '../../src/spice/wrdata.js';

export interface StageAcReference {
  /** Input DC voltage used, V, and the output it gives, V. */
  vin: number;
  vout: number;
  /** Unity-gain frequency of |v(out)/v(inp)|, Hz. */
  ugf: number;
  /** Low-frequency gain (at 1 Hz) and the −3 dB frequency, Hz. */
  a0: number;
  f3db: number;
  /** From the operating point: gm of the input device (S), cdd + capbd of the two output devices (F). */
  gm: number;
  cdd: number;
}

interface Setup {
  supply: number;
  models: { n: string; p: string };
  include: string;
  output: number;
  cap: number;
  /** Where to start looking for the input DC voltage, V. */
  guess: number;
}

/** First fall of `mag` through 1, linear in log |H| against log f. */
function crossing(freq: number[], mag: number[]): number {
  for (let k = 1; k < freq.length; k++) {
    if (mag[k - 1] >= 1 && mag[k] < 1) {
      const t = Math.log(mag[k - 1]) / (Math.log(mag[k - 1]) - Math.log(mag[k]));
      return Math.exp(Math.log(freq[k - 1]) + t * Math.log(freq[k] / freq[k - 1]));
    }
  }
  return NaN;
}

export async function stageAcReference(r: StageResult, s: Setup): Promise<StageAcReference> {
  const deck = (from: number, to: number, step: number) =>
    stageNetlist(r, { supply: s.supply, models: s.models, include: s.include, bias: 'diodes', sweep: { from: Math.max(0, from), to: Math.min(s.supply, to), step } });
  const nearest = (pts: Array<{ vin: number; vout: number }>) => pts.reduce((a, b) => (Math.abs(b.vout - s.output) < Math.abs(a.vout - s.output) ? b : a));
  const coarse = nearest(await simulateStage(deck(s.guess - 0.35, s.guess + 0.35, 5e-4)));
  const fine = nearest(await simulateStage(deck(coarse.vin - 1e-3, coarse.vin + 1e-3, 1e-6)));
  const top = (side: StageResult['input']) => `m_${side === r.input ? 'in' : 'ld'}_${side.devices[side.devices.length - 1].role}`;
  const input = `m_in_${r.input.devices[0].role}`;
  const plain = deck(fine.vin - 1e-3, fine.vin + 1e-3, 1e-4)
    .replace(/^vin inp 0 dc .*$/m, `vin inp 0 dc ${fine.vin} ac 1`)
    .replace(/^\.op\s*$/m, `cload out 0 ${s.cap}`)
    .replace(/^\.dc .*$/m, [
      '.control', 'set wr_singlescale', 'set wr_vecnames', 'option numdgt=12', 'op',
      `print v(out) @${input}[gm] @${top(r.input)}[cdd] @${top(r.input)}[capbd] @${top(r.load)}[cdd] @${top(r.load)}[capbd]`,
      'ac dec 50 1 1e12', 'wrdata ac.dat v(out)', 'quit', '.endc',
    ].join('\n'));
  const run = await runNgspice(plain);
  const value = (name: string) => {
    const m = new RegExp(`^\\s*${name.replace(/[[\]@()]/g, '\\$&')}\\s*=\\s*(\\S+)`, 'mi').exec(run.stdout);
    if (!m) throw new Error(`no ${name} in the ngspice printout`);
    return Number(m[1]);
  };
  const t = parseWrdata(run.files['ac.dat'], 'ac.dat');
  const freq = t.rows.map((row) => row[0]);
  const mag = t.rows.map((row) => Math.hypot(row[1], row[2]));
  const a0 = mag[0];
  const f3db = crossing(freq, mag.map((m) => (m / a0) * Math.SQRT2));
  const cdd = [top(r.input), top(r.load)].reduce((a, m) => a + Math.abs(value(`@${m}[cdd]`)) + Math.abs(value(`@${m}[capbd]`)), 0);
  return { vin: fine.vin, vout: value('v(out)'), ugf: crossing(freq, mag), a0, f3db, gm: value(`@${input}[gm]`), cdd };
}
