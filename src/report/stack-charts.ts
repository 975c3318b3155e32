import type { StackSpec } from '../design/types.js';
import type { StackResult } from '../solve/types.js';
import { lineChart, targetLabel, type ScatterSeries, type TargetLine } from './chart.js';
import { formatArea, formatHeadroom, polarityName } from './format.js';
import { colorAt } from './palette.js';
import { resultSlug } from './svg.js';
import type { FrontPoint } from '../solve/pareto.js';

export interface StackChartSet {
  /** Absent when the design has no Rout that a log axis can show (e.g. 0 Ω everywhere). */
  rout?: string;
  /** Absent when the curve has no finite current. */
  iout?: string;
  /** Present when a front was given. */
  pareto?: string;
  area?: string;
}

function subtitleOf(stack: StackResult): string {
  return `${polarityName(stack.device)} ${stack.topology}, stack voltage measured from the ${stack.device === 'n' ? 'ground' : 'supply'} rail`;
}

function headroomGuides(stack: StackResult, spec?: StackSpec): TargetLine[] {
  const out: TargetLine[] = [];
  if (spec) out.push({ axis: 'x', value: spec.headroom, label: targetLabel('headroom target', spec.headroom, 'V') });
  if (Number.isFinite(stack.predicted.headroom)) {
    out.push({ axis: 'x', value: stack.predicted.headroom, label: `this design ${formatHeadroom(stack.predicted.headroom)}`, kind: 'mark' });
  }
  return out;
}

/** Rout and Iout against stack voltage, with the targets, and the Pareto front when given. */
export function stackCharts(stack: StackResult, spec?: StackSpec, front?: FrontPoint[], idPrefix = ''): StackChartSet {
  const base = idPrefix + resultSlug('stack', stack.name, stack.topology, stack.chosen);
  const sub = subtitleOf(stack);
  const vAxis = { label: 'stack voltage', unit: 'V' };
  const region = spec ? [{ x: [spec.headroom, spec.span] as [number, number], label: 'targets must hold here' }] : [];

  // An infeasible design can have no usable curve at all; then there is no chart rather than a failed report.
  const routPoints = stack.curve.map((c) => ({ x: c.v, y: c.rout })).filter((p) => Number.isFinite(p.x) && Number.isFinite(p.y) && p.y > 0);
  const ioutPoints = stack.curve.map((c) => ({ x: c.v, y: c.iout })).filter((p) => Number.isFinite(p.x) && Number.isFinite(p.y));
  const rout = routPoints.length === 0 ? undefined : lineChart({
    id: `${base}-rout`, title: `Rout against stack voltage — ${stack.name}`, subtitle: sub, x: vAxis,
    y: { label: 'Rout', unit: 'Ω', scale: 'log' },
    series: [{ name: 'Rout (lookup table)', points: routPoints }],
    targets: [
      ...(spec ? [{ axis: 'y' as const, value: spec.rout, label: targetLabel('Rout target', spec.rout, 'Ω') }] : []),
      ...headroomGuides(stack, spec),
    ],
    regions: region,
  });

  const iout = ioutPoints.length === 0 ? undefined : lineChart({
    id: `${base}-iout`, title: `Output current against stack voltage — ${stack.name}`, subtitle: sub, x: vAxis,
    y: { label: 'Iout', unit: 'A', zero: true },
    series: [{ name: 'Iout (lookup table)', points: ioutPoints }],
    targets: [
      ...(spec ? [{ axis: 'y' as const, value: spec.current, label: targetLabel('Iout target', spec.current, 'A') }] : []),
      ...headroomGuides(stack, spec),
    ],
    regions: region,
  });

  if (!front || front.length === 0) return { rout, iout };
  const chosen: ScatterSeries = {
    name: `chosen (${formatArea(stack.predicted.area)})`,
    points: [{ x: stack.predicted.headroom, y: stack.predicted.rout, size: stack.predicted.area, highlight: true }],
    color: '#000000',
  };
  const byTopology = new Map<string, FrontPoint[]>();
  // The chosen design's topology first, so the legend starts with it.
  byTopology.set(stack.topology, []);
  for (const p of front) {
    const key = p.topology ?? stack.topology;
    byTopology.set(key, [...(byTopology.get(key) ?? []), p]);
  }
  const groups = [...byTopology.entries()].filter(([, pts]) => pts.length > 0);
  const drawChosen = Number.isFinite(stack.predicted.headroom) && stack.predicted.rout > 0;
  // One colour per topology; designs that miss a target are drawn hollow in a series of their own.
  const spread = (pick: (p: FrontPoint) => number): ScatterSeries[] =>
    groups.flatMap(([topology, pts], k) => {
      const color = colorAt(k);
      const series = (feasible: boolean): ScatterSeries => ({
        name: `front: ${topology}${topology === stack.topology ? ' (chosen)' : ''}${feasible ? '' : ', misses a target'}`,
        points: pts.filter((p) => (p.feasible !== false) === feasible).map((p) => ({ x: p.headroom, y: pick(p), size: p.area }))
          .filter((q) => Number.isFinite(q.x) && Number.isFinite(q.y) && q.y > 0), // log axes: positive, finite
        color,
        hollow: !feasible,
      });
      return [series(true), series(false)].filter((s) => s.points.length > 0);
    });
  const pareto = lineChart({
    id: `${base}-pareto`, title: `Pareto front: headroom against Rout — ${stack.name}`, subtitle: 'per topology, the candidates no other of it beats on headroom, Rout and area; hollow: misses a target',
    x: { label: 'headroom', unit: 'V' }, y: { label: 'Rout at headroom', unit: 'Ω', scale: 'log' },
    scatter: [...spread((p) => p.rout), ...(drawChosen ? [chosen] : [])],
    targets: spec ? [
      { axis: 'y', value: spec.rout, label: targetLabel('Rout target', spec.rout, 'Ω') },
      { axis: 'x', value: spec.headroom, label: targetLabel('headroom target', spec.headroom, 'V') },
    ] : [],
    note: 'marker area ∝ device area',
  });
  const area = lineChart({
    id: `${base}-area`, title: `Area against headroom — ${stack.name}`, subtitle: 'the same front; the price of each volt of headroom',
    x: { label: 'headroom', unit: 'V' }, y: { label: 'area W·L', unit: 'µm²', scale: 'log', si: false },
    scatter: [
      ...spread((p) => p.area * 1e12),
      ...(drawChosen ? [{ ...chosen, points: [{ ...chosen.points[0], y: stack.predicted.area * 1e12 }] }] : []),
    ],
    targets: spec ? [{ axis: 'x', value: spec.headroom, label: targetLabel('headroom target', spec.headroom, 'V') }] : [],
  });
  return { rout, iout, pareto, area };
}
