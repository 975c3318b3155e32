import type { StackSpec } from '../design/types.js';
import type { StackResult } from '../solve/types.js';
import type { Confirmation } from '../confirm/types.js';
import { lineChart, targetLabel } from './chart.js';
import { polarityName } from './format.js';
import { slug } from './svg.js';

/**
 * The simulated Rout(v) of the confirmed design drawn over the predicted one
 * (the table design's), with the targets; one simulated curve per corner.
 */
export function confirmRoutChart(c: Confirmation, stack: StackResult, spec?: StackSpec): string {
  const vAxis = { label: 'stack voltage', unit: 'V' };
  const sim = c.simulated.corners.map((f, k) => ({
    name: `ngspice ${f.corner}${c.corrected ? ', corrected' : ''}`,
    points: f.curve.map((p) => ({ x: p.v, y: p.rout })),
    dash: k === 0 ? undefined : '6 3',
  }));
  return lineChart({
    id: slug(`confirm-${stack.name}-rout`),
    title: `Rout against stack voltage, simulated over predicted — ${stack.name}`,
    subtitle: `${polarityName(stack.device)} ${stack.topology}; predicted from the lookup tables, simulated in ngspice with bias diodes`,
    x: vAxis,
    y: { label: 'Rout', unit: 'Ω', scale: 'log' },
    series: [{ name: 'tables (predicted)', points: stack.curve.map((p) => ({ x: p.v, y: p.rout })) }, ...sim],
    targets: [
      ...(spec ? [{ axis: 'y' as const, value: spec.rout, label: targetLabel('Rout target', spec.rout, 'Ω') }] : []),
      ...(spec ? [{ axis: 'x' as const, value: spec.headroom, label: targetLabel('headroom target', spec.headroom, 'V') }] : []),
      ...(Number.isFinite(c.simulated.headroom) ? [{ axis: 'x' as const, value: c.simulated.headroom, label: targetLabel('simulated headroom', c.simulated.headroom, 'V'), kind: 'mark' as const }] : []),
    ],
    regions: spec ? [{ x: [spec.headroom, spec.span], label: 'targets must hold here' }] : [],
  });
}
