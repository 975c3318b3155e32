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
}

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
}

const DATA = 'batch-sweep.dat';

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
  return out;
}
