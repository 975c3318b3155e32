import { StackwrightError } from '../errors.js';
import { runNgspice, type RunOptions } from './run.js';
import { parseWrdata } from './wrdata.js';
import { STAGE_INPUT_NODE, STAGE_OUTPUT_NODE } from './stage-netlist.js';

/** One point of a simulated input sweep. */
export interface TransferPoint {
  vin: number;
  vout: number;
}

/** One point of a measured gain curve: |dvout/dvin| by central differences. */
export interface MeasuredGain {
  vout: number;
  gain: number;
}

const FILE = 'stage-sweep.dat';

/** Simulate a stageNetlist deck's input sweep with ngspice: vout against vin. */
export async function simulateStage(netlist: string, opts: RunOptions = {}): Promise<TransferPoint[]> {
  const end = netlist.search(/^\.end\s*$/im);
  if (end < 0) throw new StackwrightError('netlist has no .end line', { where: 'simulate' });
  const control = ['.control', 'set wr_singlescale', 'set wr_vecnames', 'option numdgt=12', 'run', 'setplot dc1', `wrdata ${FILE} v(${STAGE_INPUT_NODE}) v(${STAGE_OUTPUT_NODE})`, 'quit', '.endc', ''];
  const run = await runNgspice(netlist.slice(0, end) + control.join('\n') + netlist.slice(end), opts);
  const text = run.files[FILE];
  if (text === undefined) throw new StackwrightError('ngspice wrote no sweep data (is there a .dc line?)', { where: 'simulate' });
  const t = parseWrdata(text, FILE);
  if (t.names.length !== 3) throw new StackwrightError(`expected 3 columns, found ${t.names.length}`, { where: FILE });
  return t.rows.map((r) => ({ vin: r[1], vout: r[2] }));
}

/** Gain magnitude along a transfer sweep by central differences (interior points only). */
export function measuredGain(points: readonly TransferPoint[]): MeasuredGain[] {
  const out: MeasuredGain[] = [];
  for (let k = 1; k < points.length - 1; k++) {
    const dv = points[k + 1].vin - points[k - 1].vin;
    if (dv === 0) continue;
    out.push({ vout: points[k].vout, gain: Math.abs((points[k + 1].vout - points[k - 1].vout) / dv) });
  }
  return out.sort((a, b) => a.vout - b.vout);
}
