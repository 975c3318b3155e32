import { StackwrightError } from '../errors.js';
import type { Polarity } from '../table/types.js';
import { PROBE_PREFIX, SWEEP_NODE } from './netlist.js';
import { runNgspice, type RunOptions } from './run.js';
import { parseWrdata } from './wrdata.js';
import { CURRENT_WINDOW, currentMargin, midSpan } from '../policy.js';

export interface SweepPoint {
  /** Stack voltage, V. */
  v: number;
  /** Output current magnitude, A. */
  iout: number;
}

export interface RoutPoint extends SweepPoint {
  rout: number;
}

export interface SimulatedStack {
  tag: string;
  name: string;
  device: Polarity;
  points: SweepPoint[];
}

interface Probe {
  tag: string;
  device: Polarity;
  ammeter: string;
  name: string;
}

const SWEEP_FILE = 'stack-sweep.dat';

/** The probes a stackNetlist/designNetlist deck declares. */
export function probesOf(netlist: string): Probe[] {
  const out: Probe[] = [];
  for (const line of netlist.split(/\r?\n/)) {
    if (!line.startsWith(PROBE_PREFIX + ' ')) continue;
    const [tag, device, ammeter, ...name] = line.slice(PROBE_PREFIX.length + 1).split(' ');
    out.push({ tag, device: device as Polarity, ammeter, name: name.join(' ') });
  }
  if (out.length === 0) throw new StackwrightError(`netlist has no "${PROBE_PREFIX}" lines; write it with stackNetlist or designNetlist`, { where: 'simulate' });
  return out;
}

/** Add a control block that writes the `.dc` sweep of every probe to a file. */
export function withSweepOutput(netlist: string, probes: readonly Probe[]): string {
  const end = netlist.search(/^\.end\s*$/im);
  if (end < 0) throw new StackwrightError('netlist has no .end line', { where: 'simulate' });
  const vectors = [`v(${SWEEP_NODE})`, ...probes.map((p) => `i(${p.ammeter})`)];
  const control = ['.control', 'set wr_singlescale', 'set wr_vecnames', 'option numdgt=12', 'run', 'setplot dc1', `wrdata ${SWEEP_FILE} ${vectors.join(' ')}`, 'quit', '.endc', ''];
  return netlist.slice(0, end) + control.join('\n') + netlist.slice(end);
}

/** Simulate the Vout sweep of every stack in a netlist with ngspice. */
export async function simulateStacks(netlist: string, opts: RunOptions = {}): Promise<SimulatedStack[]> {
  const probes = probesOf(netlist);
  const run = await runNgspice(withSweepOutput(netlist, probes), opts);
  const text = run.files[SWEEP_FILE];
  if (text === undefined) throw new StackwrightError('ngspice wrote no sweep data (is there a .dc line?)', { where: 'simulate' });
  const table = parseWrdata(text, SWEEP_FILE);
  if (table.names.length !== probes.length + 2) {
    throw new StackwrightError(`expected ${probes.length + 2} columns, found ${table.names.length}`, { where: SWEEP_FILE });
  }
  return probes.map((p, k) => ({
    tag: p.tag,
    name: p.name,
    device: p.device,
    points: table.rows.map((r) => ({ v: r[1], iout: r[2 + k] })),
  }));
}

/** Simulate a one-stack netlist: {v, iout}[] along the sweep. */
export async function simulateSweep(netlist: string, opts: RunOptions = {}): Promise<SweepPoint[]> {
  return (await simulateStacks(netlist, opts))[0].points;
}

/**
 * Rout = dV/dI by central differences (one-sided at the ends). Where the
 * current does not rise with v the source is at least ideal: Infinity.
 */
export function routOf(points: readonly SweepPoint[]): RoutPoint[] {
  const n = points.length;
  if (n < 2) throw new StackwrightError('need at least two sweep points for Rout', { where: 'measure' });
  return points.map((p, i) => {
    const a = points[Math.max(0, i - 1)];
    const b = points[Math.min(n - 1, i + 1)];
    const di = b.iout - a.iout;
    return { ...p, rout: di > 0 ? (b.v - a.v) / di : Infinity };
  });
}

/** Linear interpolation of iout and rout at stack voltage v (inside the sweep only). */
export function interpolateCurve(curve: readonly RoutPoint[], v: number): RoutPoint {
  const n = curve.length;
  if (!(v >= curve[0].v - 1e-12 && v <= curve[n - 1].v + 1e-12)) {
    throw new StackwrightError(`v = ${v} V is outside the simulated sweep ${curve[0].v}..${curve[n - 1].v} V`, { kind: 'range', where: 'measure' });
  }
  let k = 0;
  while (k < n - 2 && curve[k + 1].v < v) k++;
  const a = curve[k];
  const b = curve[k + 1];
  const t = b.v === a.v ? 0 : (v - a.v) / (b.v - a.v);
  const rout = Number.isFinite(a.rout) && Number.isFinite(b.rout) ? a.rout + t * (b.rout - a.rout) : Math.min(a.rout, b.rout);
  return { v, iout: a.iout + t * (b.iout - a.iout), rout };
}

export interface HeadroomTargets {
  /** Minimum Rout, Ω. */
  rout: number;
  /** Spec headroom, V (sets the mid-span reference point). */
  headroom: number;
  /** Top of the span, V. */
  span: number;
}

export { midSpan };

/**
 * Measured headroom: the lowest v such that for every v' in [v, span]
 * Rout(v') >= target and |I(v') - I(v_mid)| <= 1 % of I(v_mid). The crossing
 * between the highest failing and the next passing sweep point is
 * interpolated on the worse of the two margins. Infinity when the targets fail at span.
 */
export function measuredHeadroom(curve: readonly RoutPoint[], t: HeadroomTargets): number {
  const iMid = interpolateCurve(curve, midSpan(t)).iout;
  const pts = curve.filter((p) => p.v <= t.span + 1e-9);
  const margin = (p: RoutPoint) => Math.min(Math.min(p.rout / t.rout - 1, 1), CURRENT_WINDOW * currentMargin(p.iout, iMid));
  let j = pts.length - 1;
  if (j < 0 || margin(pts[j]) < 0) return Infinity;
  while (j > 0 && margin(pts[j - 1]) >= 0) j--;
  if (j === 0) return pts[0].v;
  const a = pts[j - 1];
  const b = pts[j];
  const ma = margin(a);
  const mb = margin(b);
  return a.v + ((b.v - a.v) * (0 - ma)) / (mb - ma);
}

export interface OpPoint {
  /** Output current magnitude of each stack, by probe tag. */
  iout: Record<string, number>;
  /** Every node voltage ngspice reports at the operating point, by node name. */
  nodes: Record<string, number>;
}

/** Run the netlist's `.op` and read each stack's output current and all node voltages. */
export async function simulateOp(netlist: string, opts: RunOptions = {}): Promise<OpPoint> {
  const probes = probesOf(netlist);
  const end = netlist.search(/^\.end\s*$/im);
  if (end < 0) throw new StackwrightError('netlist has no .end line', { where: 'simulate' });
  const control = ['.control', 'option numdgt=10', 'op', 'print all', 'quit', '.endc', ''];
  const run = await runNgspice(netlist.slice(0, end) + control.join('\n') + netlist.slice(end), opts);
  const values: Record<string, number> = {};
  for (const m of run.stdout.matchAll(/^\s*(\S+)\s*=\s*([-+0-9.eE]+)\s*$/gm)) values[m[1].toLowerCase()] = Number(m[2]);
  const iout: Record<string, number> = {};
  for (const p of probes) {
    const key = `${p.ammeter}#branch`;
    if (!(key in values)) throw new StackwrightError(`ngspice printed no current for ${p.ammeter}`, { where: 'simulate' });
    iout[p.tag] = values[key];
  }
  const nodes: Record<string, number> = {};
  for (const [k, v] of Object.entries(values)) {
    const m = /^v\((.+)\)$/.exec(k);
    if (m) nodes[m[1]] = v;
    else if (!k.includes('#')) nodes[k] = v;
  }
  return { iout, nodes };
}
