import { StackwrightError } from '../errors.js';
import { formatSpice } from '../units/index.js';
import { CAUTION } from '../solve/types.js';
import { SWEEP_NODE, SWEEP_SOURCE } from '../spice/netlist.js';
import { runNgspice, type RunOptions } from '../spice/run.js';
import { parseWrdata } from '../spice/wrdata.js';

/**
 * One independent circuit of a batched deck: its elements (names and nodes
 * carry its own tag) driven by the shared sweep node, and the vectors to save.
 * Stacks use the sweep as their stack voltage; a circuit needing another
 * sweep (a stage's input) maps node SWEEP_NODE onto it with a controlled source.
 */
export interface BatchCircuit {
  tag: string;
  lines: string[];
  vectors: string[];
  /** Small-signal response wanted after the sweep: sources set before the operating point, complex vectors to save. */
  ac?: BatchAc;
}

/** An AC analysis of one circuit: its voltage sources set (`alter`) to these DC values first, then the vectors saved. */
export interface BatchAc {
  set: Array<{ source: string; dc: number }>;
  vectors: string[];
}

/** AC sweep of a batched deck: log-spaced from AC_FROM to AC_TO, AC_PER_DECADE points a decade, Hz. */
export const AC_FROM = 1;
export const AC_TO = 1e12;
export const AC_PER_DECADE = 20;

export interface BatchDeck {
  title: string;
  /** Model lines of this corner. */
  models: string;
  supply: number;
  /** Sweep of node SWEEP_NODE from 0 to `top` in `step`, V. */
  top: number;
  step: number;
  circuits: BatchCircuit[];
}

/** Columns of one circuit's vectors along the sweep. */
export interface BatchColumns {
  sweep: Float64Array;
  columns: Float64Array[];
  /** With `ac`: frequencies (Hz) and each AC vector's real and imaginary parts. */
  ac?: { freq: Float64Array; re: Float64Array[]; im: Float64Array[] };
}

const DATA = 'batch-sweep.dat';
const AC_DATA = 'batch-ac.dat';

/**
 * Control lines of the AC analysis after the sweep: the sweep source back at 0 V,
 * each circuit's sources set for its operating point, `ac` (which solves that
 * operating point first) and every complex vector written to one file.
 */
function acLines(circuits: readonly BatchCircuit[]): string[] {
  const ac = circuits.flatMap((c) => (c.ac ? [c.ac] : []));
  if (ac.length === 0) return [];
  return [
    `alter ${SWEEP_SOURCE} dc = 0`,
    ...ac.flatMap((a) => a.set.map((x) => `alter ${x.source} dc = ${formatSpice(x.dc)}`)),
    `ac dec ${AC_PER_DECADE} ${formatSpice(AC_FROM)} ${formatSpice(AC_TO)}`,
    `wrdata ${AC_DATA} ${ac.flatMap((a) => a.vectors).join(' ')}`,
  ];
}

/** Many independent circuits in one deck, one `.dc` sweep, every vector written to one file. */
export function batchDeck(d: BatchDeck): string {
  const vectors = d.circuits.flatMap((c) => c.vectors);
  return [
    `* ${d.title} (Berkeley SPICE3 syntax, for ngspice): ${d.circuits.length} independent circuits`,
    `* ${CAUTION}`,
    ...d.models.split(/\r?\n/),
    `vdd vdd 0 dc ${formatSpice(d.supply)}`,
    `${SWEEP_SOURCE} ${SWEEP_NODE} 0 dc 0`,
    ...d.circuits.flatMap((c) => ['', ...c.lines]),
    '',
    '* tight tolerances: Rout comes from differences of nA in the sweep',
    '.options reltol=1e-6 abstol=1e-15 vntol=1e-9',
    `.dc ${SWEEP_SOURCE} 0 ${formatSpice(d.top)} ${formatSpice(d.step)}`,
    '.control',
    'set wr_singlescale',
    'set wr_vecnames',
    'option numdgt=12',
    'run',
    `wrdata ${DATA} v(${SWEEP_NODE}) ${vectors.join(' ')}`,
    ...acLines(d.circuits),
    'quit',
    '.endc',
    '.end',
    '',
  ].join('\n');
}

/** Run a batched deck and split the data by circuit tag. */
export async function runBatch(d: BatchDeck, run: RunOptions = {}): Promise<Map<string, BatchColumns>> {
  const result = await runNgspice(batchDeck(d), run);
  const text = result.files[DATA];
  if (text === undefined) throw new StackwrightError('ngspice wrote no sweep data', { kind: 'internal', where: 'ngspice' });
  const table = parseWrdata(text, DATA);
  const width = 2 + d.circuits.reduce((a, c) => a + c.vectors.length, 0);
  if (table.names.length !== width) throw new StackwrightError(`expected ${width} columns, found ${table.names.length}`, { kind: 'internal', where: DATA });
  const column = (j: number) => Float64Array.from(table.rows, (r) => r[j]);
  const sweep = column(1);
  const out = new Map<string, BatchColumns>();
  let j = 2;
  for (const c of d.circuits) {
    out.set(c.tag, { sweep, columns: c.vectors.map(() => column(j++)) });
  }
  if (d.circuits.some((c) => c.ac)) readAc(d, result.files[AC_DATA], out);
  return out;
}

// The AC file: frequency, then two columns (real, imaginary) per complex vector, circuits in deck order.
function readAc(d: BatchDeck, text: string | undefined, out: Map<string, BatchColumns>): void {
  if (text === undefined) throw new StackwrightError('ngspice wrote no AC data', { kind: 'internal', where: 'ngspice' });
  const table = parseWrdata(text, AC_DATA);
  const width = 1 + 2 * d.circuits.reduce((a, c) => a + (c.ac?.vectors.length ?? 0), 0);
  if (table.names.length !== width) throw new StackwrightError(`expected ${width} columns, found ${table.names.length}`, { kind: 'internal', where: AC_DATA });
  const column = (j: number) => Float64Array.from(table.rows, (r) => r[j]);
  const freq = column(0);
  let j = 1;
  for (const c of d.circuits) {
    if (!c.ac) continue;
    const re: Float64Array[] = [];
    const im: Float64Array[] = [];
    for (let k = 0; k < c.ac.vectors.length; k++, j += 2) {
      re.push(column(j));
      im.push(column(j + 1));
    }
    out.get(c.tag)!.ac = { freq, re, im };
  }
}
