import type { Harder } from '../solve/compare.js';
import { verdictLine } from './verdict.js';

const percent3 = (x: number): string => `${(x * 100).toFixed(3)} %`;
const millivolts = (x: number | null): string => (x === null ? 'none' : `${(x * 1e3).toFixed(0)} mV`);

/**
 * One harder target as a phrase of `port`'s "harder on KIT" line. `manyCorners` names the
 * corner in a binding verdict when the spec has several.
 */
export function harderText(h: Harder, manyCorners: boolean): string {
  switch (h.quantity) {
    case 'feasible':
      return `infeasible on the new kit${h.binding ? `: ${verdictLine(h.binding, manyCorners)}` : ''}`;
    case 'rout':
      return `rout: margin ${h.fromMargin.toFixed(2)}x -> ${h.toMargin.toFixed(2)}x of the target`;
    case 'headroom':
      return `headroom: slack ${millivolts(h.fromSlack)} -> ${millivolts(h.toSlack)}`;
    case 'mismatch':
      return `mismatch: σ ${percent3(h.from)} -> ${percent3(h.to)} (target ${percent3(h.required)})`;
    case 'area':
      return `area: ${h.ratio.toFixed(2)}x larger to meet the same targets`;
    case 'topology':
      return `topology: ${h.from} -> ${h.to}`;
  }
}

/** The whole "harder on KIT" list: phrases joined by "; ", or "nothing". */
export function harderLine(list: readonly Harder[], manyCorners: boolean): string {
  return list.length ? list.map((h) => harderText(h, manyCorners)).join('; ') : 'nothing';
}
