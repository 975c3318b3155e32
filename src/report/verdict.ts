import type { Verdict } from '../solve/evaluate/verdict.js';
import { formatEng } from '../units/index.js';
import { apart, formatPercent } from './format.js';
import { CURRENT_WINDOW } from '../policy.js';

/** A voltage as every sentence shows it: three decimals of a volt (headroom is reported to the mV). */
export const volts = (x: number) => `${x.toFixed(3)} V`;
const pct = formatPercent;
/** Both figures in SI units, apart when they differ (see apart). */
const pair = (got: number, need: number, unit: string): [string, string] => apart(got, need, (x, d) => formatEng(x, unit, d));

/** Words for one verdict: "rout 12.3 MΩ < 20 MΩ at 0.500 V", "headroom 0.520 V ≤ 0.550 V". */
export function verdictText(v: Verdict): string {
  const { required: need, achieved: got, at } = v;
  const where = at === null ? '' : ` at ${volts(at)}`;
  switch (v.target) {
    case 'table':
      return `table: the table does not cover the bias${where}`;
    case 'rout': {
      if (got === null || got <= 0) return `rout: no usable Rout${where} (outside the table); needs ${formatEng(need ?? 0, 'Ω')}`;
      const [a, b] = pair(got, need ?? 0, 'Ω');
      return `rout ${a} ${need !== null && got >= need ? '≥' : '<'} ${b}${where}`;
    }
    case 'headroom':
      return `headroom ${got === null ? 'never met' : volts(got)} ${got !== null && need !== null && got <= need ? '≤' : '>'} ${volts(need ?? 0)}`;
    case 'iout': {
      if (got === null || need === null) return `iout: no current${where}`;
      // Where it is measured: a miss at the span end must not read as the mid-span Iout of the tables beside it.
      // Against the 1 % window: a miss of 1.004 % must not read "1.00 % off".
      const off = (100 * (got - need)) / need;
      const [mag] = apart(Math.abs(off), 100 * CURRENT_WINDOW, (x, d) => x.toFixed(d - 1));
      return `iout ${formatEng(got, 'A')}${where} is ${off < 0 ? '-' : ''}${mag} % off ${formatEng(need, 'A')}`;
    }
    case 'mismatch':
      return `mismatch σ ${got === null ? 'unknown' : pct(got)} vs ${need === null ? 'no target' : pct(need)}`;
    case 'saturation': {
      // The top device's verdict is the stacked bias's: no allowed bottom diode leaves it room (got: the most VDS any does).
      if (v.device === 'top' && got !== null && at !== null) {
        return `saturation: no room for the top device: every bottom diode within the width limits and gm/ID range has VGS ≥ ${volts(at - got)}, leaving it VDS ≤ ${formatEng(got, 'V')} at mid-span ${volts(at)}`;
      }
      if (v.device === null || got === null) {
        return `saturation: no lower device stays saturated${need === null ? '' : ` (VDSsat ≥ ${formatEng(need, 'V')} each)`}${at === null ? '' : ` below the ${volts(at)} headroom target`}`;
      }
      const [a, b] = pair(got, need ?? 0, 'V');
      return `saturation: ${v.device} VDS ${a} ${need !== null && got >= need ? '≥' : '<'} VDSsat ${b} at mid-span`;
    }
    case 'width': {
      if (got === null) return `width: every candidate needed a device narrower than the minimum width ${formatEng(need ?? 0, 'm')}`;
      const [a, b] = pair(got, need ?? 0, 'm');
      // A stacked bias with no design at all within the limit (a top device with room above its bottom diode).
      if (v.device === null && at !== null && need !== null && got > need) {
        return `width: every design (a top device with room above its bottom diode at mid-span ${volts(at)}) has a device at least ${a} wide, above the ${b} width limit`;
      }
      // Without a device the verdict is the stack's (the narrowest any design meeting Rout and headroom needs); with
      // one it is about one design, such as a corner row's, and must not read as a claim about every design.
      if (v.device === null && need !== null && got > need) return `width: every design meeting Rout and headroom has a device at least ${a} wide, above the ${b} width limit`;
      return `width: ${v.device ?? 'widest'} W ${a} ${need !== null && got > need ? '>' : '≤'} the ${b} width limit`;
    }
  }
}

/** A verdict with its corner named first when the design was checked on several corners. */
export function verdictLine(v: Verdict, manyCorners: boolean): string {
  return manyCorners && v.corner !== null ? `corner ${v.corner}: ${verdictText(v)}` : verdictText(v);
}

/** Why a stack (or a corner result) fails, in words; '' when it does not. */
export function bindingText(s: { binding?: Verdict; corners?: readonly unknown[] }): string {
  return s.binding ? verdictLine(s.binding, (s.corners?.length ?? 0) > 1) : '';
}
