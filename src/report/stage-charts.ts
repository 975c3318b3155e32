import type { StageSpec } from '../design/types.js';
import type { StageFrontPoint, StageResult } from '../solve/stage-types.js';
import { lineChart, targetLabel, type ScatterSeries, type TargetLine } from './chart.js';
import { formatArea } from './format.js';
import { resultSlug } from './svg.js';

export interface StageChartSet {
  /** Gain against output voltage with the gain target and the swing interval. */
  gain?: string;
  /** Trade front: swing at the gain target against gain at the design point. */
  trade?: string;
  /** The same front: area against swing. */
  area?: string;
}

/** Charts of one stage: its gain curve, and the trade front over the explored designs when given. */
export function stageCharts(s: StageResult, spec?: StageSpec, front?: StageFrontPoint[], idPrefix = ''): StageChartSet {
  const base = idPrefix + resultSlug('stage', s.name, s.load.topology, s.chosen);
  const out: StageChartSet = {};
  const points = s.curve.filter((c) => c.gain > 0).map((c) => ({ x: c.vout, y: c.gain }));
  const p = s.predicted;
  if (points.length > 1) {
    const targets: TargetLine[] = [{ axis: 'x', value: p.output, label: targetLabel('design point', p.output, 'V'), kind: 'mark' }];
    if (spec) targets.unshift({ axis: 'y', value: spec.gain, label: targetLabel('gain target', spec.gain, '') });
    out.gain = lineChart({
      id: `${base}-gain`, title: `Gain against output voltage — ${s.name}`,
      subtitle: `${s.input.device}-input ${s.input.topology}, ${s.load.device}-type ${s.load.topology} load; A = gm_in·(Rout_in ∥ Rout_load)`,
      x: { label: 'output voltage', unit: 'V' }, y: { label: 'gain |dVout/dVin|', unit: '', scale: 'log' },
      series: [{ name: 'gain (lookup table)', points }],
      targets,
      regions: p.vlow !== null && p.vhigh !== null ? [{ x: [p.vlow, p.vhigh], label: `swing ${(p.swing * 1000).toFixed(0)} mV` }] : [],
    });
  }
  const pts = (front ?? []).filter((f) => f.gain > 0 && f.swing > 0);
  if (pts.length === 0) return out;
  const byLoad = new Map<string, StageFrontPoint[]>();
  for (const f of pts) byLoad.set(f.load, [...(byLoad.get(f.load) ?? []), f]);
  const spread = (x: (f: StageFrontPoint) => number, y: (f: StageFrontPoint) => number): ScatterSeries[] =>
    [...byLoad.entries()].map(([load, list]) => ({ name: `${load} load`, points: list.map((f) => ({ x: x(f), y: y(f), size: f.area })) }));
  const drawChosen = p.gain > 0 && p.swing > 0;
  const chosen = (x: number, y: number): ScatterSeries[] => (drawChosen ? [{ name: `chosen (${formatArea(p.area)})`, points: [{ x, y, size: p.area, highlight: true }], color: '#000000' }] : []);
  out.trade = lineChart({
    id: `${base}-trade`, title: `Trade front: swing against gain — ${s.name}`,
    subtitle: 'explored designs no other beats on gain, swing and area: longer L and deeper cascodes buy gain with headroom',
    x: { label: 'gain at the design point', unit: '', scale: 'log' }, y: { label: 'swing at the gain target', unit: 'V' },
    scatter: [...spread((f) => f.gain, (f) => f.swing), ...chosen(p.gain, p.swing)],
    targets: spec ? [
      { axis: 'y', value: spec.swing, label: targetLabel('swing target', spec.swing, 'V') },
      { axis: 'x', value: spec.gain, label: targetLabel('gain target', spec.gain, '') },
    ] : [],
    note: 'marker area ∝ device area',
  });
  out.area = lineChart({
    id: `${base}-area`, title: `Area against swing — ${s.name}`, subtitle: 'the same front; the price of each volt of swing',
    x: { label: 'swing at the gain target', unit: 'V' }, y: { label: 'area W·L', unit: 'µm²', scale: 'log', si: false },
    scatter: [...spread((f) => f.swing, (f) => f.area * 1e12), ...chosen(p.swing, p.area * 1e12)],
    targets: spec ? [{ axis: 'x', value: spec.swing, label: targetLabel('swing target', spec.swing, 'V') }] : [],
  });
  return out;
}
