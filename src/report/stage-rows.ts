import type { StageFrontPoint, StageResult, StageVerdict } from '../solve/stage-types.js';
import { apart, eng, formatArea, formatMicrons } from './format.js';
import { formatEng } from '../units/index.js';
import type { Grid } from './rows.js';
import { routOf } from '../stack/index.js';

function gainText(x: number | null): string {
  return x === null || !Number.isFinite(x) ? '—' : Number(x.toPrecision(4)).toString();
}

/**
 * Words for a stage verdict: "swing at the gain target 903 mV ≥ 900 mV (+3 mV, +0.3 %)";
 * `showCorner` prefixes "corner ss: " (when the run has several corners).
 */
export function stageVerdictText(v: StageVerdict, showCorner = false): string {
  const where = showCorner && v.corner ? `corner ${v.corner}: ` : '';
  if (v.target === 'table') return `${where}the tables cannot hold the stage's bias (a bias diode or the design point lies outside them)`;
  if (v.target === 'width') {
    const by = v.achieved === null || v.required === null ? '' : ` (the narrowest needs ${formatMicrons(v.achieved)} > ${formatMicrons(v.required)})`;
    return `${where}every design of a side the search found has a device wider than the width limit${by}`;
  }
  if (v.target === 'saturation') {
    const at = v.at === null ? 'the design point' : `the ${eng(v.at, 'V')} design point`;
    return `${where}no design of a side keeps its lower devices saturated at ${at} (too little room between the output and that side's rail)`;
  }
  if (v.target === 'vin') {
    // Short: it also stands in the brief table's binding column.
    if (v.achieved === null || v.required === null) return `${where}input DC voltage: not reached`;
    const side = v.achieved < v.required ? `below the ${eng(v.required, 'V')} rail` : `above the ${eng(v.required, 'V')} supply`;
    return `${where}input DC voltage ${eng(v.achieved, 'V')} ${side}`;
  }
  const name = v.target === 'gain' ? (v.at === null ? 'gain held over the swing target' : `gain at the ${eng(v.at, 'V')} design point`) : v.target === 'swing' ? 'swing at the gain target' : 'GBW';
  if (v.achieved === null || v.required === null) return `${where}${name}: not reached`;
  const ok = v.achieved >= v.required;
  const pct = ((v.achieved / v.required - 1) * 100).toFixed(1);
  const by = v.target === 'swing' ? `${ok ? '+' : '-'}${eng(Math.abs(v.achieved - v.required), 'V')}, ${ok ? '+' : ''}${pct} %` : `${ok ? '+' : ''}${pct} %`;
  // Apart when they differ: a miss never reads "1500 < 1500".
  const unit = v.target === 'gbw' ? 'Hz' : 'V';
  const [a, b] = v.target === 'gain'
    ? apart(v.achieved, v.required, (x, d) => String(Number(x.toPrecision(d))), 4)
    : apart(v.achieved, v.required, (x, d) => formatEng(x, unit, d));
  return `${where}${name}${v.best ? ' at best' : ''} ${a} ${ok ? '≥' : '<'} ${b} (${by})`;
}

/**
 * The stage's gain, swing and area as the summary tables show them; '—' for each when no design was realised (the
 * library's placeholders are 0, which would read as a design of no area and no gain beside "none realised").
 */
export function stageFigures(s: StageResult): { gain: string; swing: string; area: string } {
  if (s.input.devices.length === 0 && s.load.devices.length === 0) return { gain: '—', swing: '—', area: '—' };
  return { gain: gainText(s.predicted.gain), swing: eng(s.predicted.swing, 'V'), area: formatArea(s.predicted.area) };
}

/** One sentence on a stage: feasible with its tightest target, or which target binds and the nearest points. */
export function stageVerdict(s: StageResult): string {
  const many = (s.corners?.length ?? 0) > 1;
  const tag = s.chosen === true ? ' (chosen by the objective)' : s.chosen === false ? ' (alternative)' : '';
  if (s.feasible) return `meets all targets; tightest: ${s.tightest ? stageVerdictText(s.tightest, many) : '—'}${tag}`;
  const parts = [`does not meet the targets: binding ${s.binding ? stageVerdictText(s.binding, many) : '—'}`];
  if (s.nearest) {
    // With several corners the nearest points are the nominal corner's: say so.
    const at = many ? ` at corner ${s.nearest.corner}` : '';
    parts.push(`nearest points${at}: best gain held over the swing target ${gainText(s.nearest.gainAtSwing)}, best swing at the gain target ${eng(s.nearest.swingAtGain, 'V')}`);
    const all = s.nearest.overCorners;
    if (all) parts.push(`at every corner at once: best gain held over the swing target ${gainText(all.gainAtSwing)}, best swing at the gain target ${eng(all.swingAtGain, 'V')}`);
  }
  return parts.join('; ') + tag;
}

export function stagePredictedGrid(s: StageResult): Grid {
  const p = s.predicted;
  // No design could be realised (the binding says why): no figure of one to show, and no claim about the tables.
  if (s.input.devices.length === 0 && s.load.devices.length === 0) {
    return { headers: ['quantity', 'value'], rows: [['design point (vout)', eng(p.output, 'V')], ['design', '— (none realised)'], ['candidates evaluated', String(s.evaluated)]] };
  }
  const rows = [
    ['gain at the design point', gainText(p.gain)],
    ['design point (vout, vin)', `${eng(p.output, 'V')}, ${eng(p.vin, 'V')}`],
    ['current', eng(p.current, 'A')],
    ['swing (gain ≥ target)', eng(p.swing, 'V')],
    ['swing interval', p.vlow === null || p.vhigh === null ? '—' : `${eng(p.vlow, 'V')} .. ${eng(p.vhigh, 'V')}`],
    ['GBW', p.gbw === null ? '— (no gbw target)' : eng(p.gbw, 'Hz')],
    ['C_out (table cdd of the output devices)', p.cout === null ? '— (tables lack capacitances; GBW uses cap alone)' : eng(p.cout, 'F')],
    ['area (both sides)', formatArea(p.area)],
    ['candidates evaluated', String(s.evaluated)],
  ];
  return { headers: ['quantity', 'value'], rows };
}

/** The table result beside the square-law hand analysis. */
export function stageSquareLawGrid(s: StageResult): Grid | undefined {
  const q = s.squareLaw;
  if (!q) return undefined;
  const gm = s.input.devices[0]?.gm ?? NaN;
  const rows = [
    ['gm of the input device', eng(gm, 'S'), eng(q.gm, 'S')],
    ['gain at the design point', gainText(s.predicted.gain), gainText(q.gain)],
    ['Rout input side', eng(routOf(s.input.devices), 'Ω'), eng(q.rin, 'Ω')],
    ['Rout load side', eng(routOf(s.load.devices), 'Ω'), eng(q.rload, 'Ω')],
    ['swing (table: at the gain target; square law: supply − Σ VDSsat)', eng(s.predicted.swing, 'V'), eng(q.swing, 'V')],
    ['headroom input / load (rule of thumb)', '—', `${eng(q.headroom.input, 'V')} / ${eng(q.headroom.load, 'V')}`],
  ];
  return { headers: ['quantity', 'lookup table', 'square law'], rows };
}

export function stageCornerGrid(s: StageResult): Grid | undefined {
  if (!s.corners || s.corners.length === 0) return undefined;
  return {
    headers: ['corner', 'meets targets', 'gain', 'swing', 'vlow .. vhigh', 'vin', 'current', 'bias gates (input; load)', 'binding / tightest'],
    rows: s.corners.map((c) => {
      const p = c.predicted;
      const v = c.binding ?? c.tightest;
      return [
        c.corner, c.feasible ? 'yes' : 'NO', gainText(p.gain), eng(p.swing, 'V'),
        p.vlow === null || p.vhigh === null ? '—' : `${eng(p.vlow, 'V')} .. ${eng(p.vhigh, 'V')}`,
        eng(p.vin, 'V'), eng(p.current, 'A'),
        `${c.gates.input.map((g) => eng(g, 'V')).join(', ') || '—'}; ${c.gates.load.map((g) => eng(g, 'V')).join(', ') || '—'}`,
        v ? stageVerdictText(v) : '—',
      ];
    }),
  };
}

/** One row per load topology tried (auto). */
export function stageTopologiesGrid(all: readonly StageResult[]): Grid {
  return {
    headers: ['load topology', 'status', 'gain', 'swing', 'area', 'binding'],
    rows: all.map((x) => {
      const f = stageFigures(x);
      return [
        x.load.topology, x.chosen ? 'chosen' : x.feasible ? 'feasible' : 'INFEASIBLE', f.gain, f.swing,
        f.area, x.feasible || !x.binding ? '' : stageVerdictText(x.binding, (x.corners?.length ?? 0) > 1),
      ];
    }),
  };
}

/**
 * The gain curve as rows every `step` volts of output: gain, input voltage, and
 * marks for the design point and the swing interval (text has no chart).
 */
export function stageCurveGrid(s: StageResult, target: number | undefined, step = 0.1): Grid | undefined {
  if (s.curve.length === 0) return undefined;
  const p = s.predicted;
  const rows: string[][] = [];
  let next = -Infinity;
  for (const c of s.curve) {
    const design = Math.abs(c.vout - p.output) < 1e-9;
    if (c.vout < next - 1e-9 && !design) continue;
    if (!design) next = c.vout + step;
    const inside = p.vlow !== null && p.vhigh !== null && c.vout >= p.vlow && c.vout <= p.vhigh;
    const mark = design ? 'design point' : inside ? 'in swing' : target !== undefined && c.gain < target ? 'below target' : '';
    rows.push([eng(c.vout, 'V'), gainText(c.gain), eng(c.vin, 'V'), mark]);
  }
  return { headers: ['vout', 'gain', 'vin', ''], rows };
}

/** The trade front (explored designs no other beats on gain, swing and area), swing ascending. */
export function stageFrontGrid(front: readonly StageFrontPoint[], most = 12): Grid | undefined {
  if (front.length === 0) return undefined;
  // Evenly thinned so a long front still fits a terminal.
  const pick = front.length <= most ? front : Array.from({ length: most }, (_, k) => front[Math.round((k * (front.length - 1)) / (most - 1))]);
  return {
    headers: ['swing at gain target', 'gain at design point', 'gain held over swing target', 'area', 'load', 'L input / load', 'meets targets'],
    rows: pick.map((f) => [
      eng(f.swing, 'V'), gainText(f.gain), gainText(f.gainAtSwing), formatArea(f.area), f.load,
      `${f.devices.input.map((d) => formatMicrons(d.l)).join('+')} / ${f.devices.load.map((d) => formatMicrons(d.l)).join('+')}`,
      f.feasible ? 'yes' : 'no',
    ]),
  };
}
