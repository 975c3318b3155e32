import type { Harder } from '../solve/compare.js';
import type { StageHarder } from '../solve/stage-port.js';
import { formatEng } from '../units/index.js';
import { verdictLine } from './verdict.js';
import { stageVerdictText } from './stage-rows.js';

const percent3 = (x: number): string => `${(x * 100).toFixed(3)} %`;
const marginText = (what: string, h: { fromMargin: number; toMargin: number }): string => `${what}: margin ${h.fromMargin.toFixed(2)}x -> ${h.toMargin.toFixed(2)}x of the target`;
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
      return marginText('rout', h);
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

const signedMillivolts = (x: number): string => `${x < 0 ? '-' : ''}${(Math.abs(x) * 1e3).toFixed(0)} mV`;

/** One harder target of a gain stage as a phrase of `port`'s "harder on KIT" line. */
export function stageHarderText(h: StageHarder, manyCorners: boolean): string {
  switch (h.quantity) {
    case 'feasible':
      return `infeasible on the new kit${h.binding ? `: ${stageVerdictText(h.binding, manyCorners)}` : ''}`;
    case 'gain':
      return marginText('gain', h);
    case 'swing':
      return `swing: slack ${signedMillivolts(h.fromSlack)} -> ${signedMillivolts(h.toSlack)}`;
    case 'gbw':
      return `${marginText('GBW', h)} (${formatEng(h.from, 'Hz')} -> ${formatEng(h.to, 'Hz')})`;
    case 'area':
      return harderText(h, manyCorners);
    case 'topology':
      return `load topology: ${h.from} -> ${h.to}`;
  }
}

/** The whole "harder on KIT" list of a stack or a stage: phrases joined by "; ", or "nothing". */
function joined<T>(list: readonly T[], text: (h: T) => string): string {
  return list.length ? list.map(text).join('; ') : 'nothing';
}

export function harderLine(list: readonly Harder[], manyCorners: boolean): string {
  return joined(list, (h) => harderText(h, manyCorners));
}

export function stageHarderLine(list: readonly StageHarder[], manyCorners: boolean): string {
  return joined(list, (h) => stageHarderText(h, manyCorners));
}
