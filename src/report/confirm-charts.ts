import type { StackSpec } from '../design/types.js';
import type { StackResult } from '../solve/types.js';
import type { Confirmation } from '../confirm/types.js';
import type { StageSpec } from '../design/types.js';
import type { StageResult } from '../solve/stage-types.js';
import type { StageConfirmation } from '../confirm/stage-types.js';
import { lineChart, targetLabel } from './chart.js';
import { polarityName } from './format.js';
import { slug } from './svg.js';
import { formatEng } from '../units/index.js';

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

/** The simulated gain against output voltage over the predicted one, with the gain target and the simulated swing. */
export function stageConfirmChart(c: StageConfirmation, stage: StageResult, spec?: StageSpec): string {
  const sim = c.simulated.corners.map((f, k) => ({
    name: `ngspice ${f.corner}${c.corrected ? ', corrected' : ''}`,
    points: f.curve.filter((p) => p.gain > 0).map((p) => ({ x: p.vout, y: p.gain })),
    dash: k === 0 ? undefined : '6 3',
  }));
  const s = c.simulated;
  return lineChart({
    id: slug(`confirm-stage-${stage.name}-gain`),
    title: `Gain against output voltage, simulated over predicted — ${stage.name}`,
    subtitle: "lookup tables against ngspice (bias diodes, input set so the output steps along a sweep)",
    x: { label: 'output voltage', unit: 'V' },
    y: { label: 'gain |dVout/dVin|', unit: '', scale: 'log' },
    series: [{ name: 'tables (predicted)', points: stage.curve.filter((p) => p.gain > 0).map((p) => ({ x: p.vout, y: p.gain })) }, ...sim],
    targets: spec ? [{ axis: 'y' as const, value: spec.gain, label: targetLabel('gain target', spec.gain, '') }] : [],
    regions: s.vlow !== null && s.vhigh !== null ? [{ x: [s.vlow, s.vhigh], label: `simulated swing ${(s.swing * 1000).toFixed(0)} mV` }] : [],
  });
}

/**
 * With a gbw target: the simulated open-loop gain against frequency at the design point, one curve per corner, over
 * the single-pole response the tables predict (gain A0 and GBW as predicted: A0 / √(1 + (f·A0/GBW)²)); the GBW target
 * and the simulated unity-gain frequency marked. Empty when the confirmation carries no response.
 */
export function stageResponseChart(c: StageConfirmation, stage: StageResult, spec?: StageSpec): string {
  if (c.simulated.response.length === 0) return '';
  const sim = c.simulated.corners.map((f, k) => ({
    name: `ngspice ${f.corner}${c.corrected ? ', corrected' : ''}`,
    points: f.response.filter((p) => p.gain > 0).map((p) => ({ x: p.f, y: p.gain })),
    dash: k === 0 ? undefined : '6 3',
  }));
  const a0 = stage.predicted.gain;
  const gbw = stage.predicted.gbw;
  const predicted = a0 > 0 && gbw !== null && gbw > 0
    ? [{ name: 'tables (single pole)', points: c.simulated.response.map((p) => ({ x: p.f, y: a0 / Math.sqrt(1 + ((p.f * a0) / gbw) ** 2) })) }]
    : [];
  const simulatedGbw = c.simulated.gbw;
  return lineChart({
    id: slug(`confirm-stage-${stage.name}-response`),
    title: `Open-loop gain against frequency, simulated — ${stage.name}`,
    subtitle: `ngspice AC analysis at the design point with ${spec?.cap !== undefined ? formatEng(spec.cap, 'F') : 'the load capacitance'} on the output`,
    x: { label: 'frequency', unit: 'Hz', scale: 'log' },
    y: { label: 'gain |vout/vin|', unit: '', scale: 'log' },
    series: [...predicted, ...sim],
    targets: [
      { axis: 'y' as const, value: 1, label: 'unity gain', kind: 'target' as const },
      ...(spec?.gbw !== undefined ? [{ axis: 'x' as const, value: spec.gbw, label: targetLabel('GBW target', spec.gbw, 'Hz') }] : []),
      ...(simulatedGbw !== null && simulatedGbw > 0 ? [{ axis: 'x' as const, value: simulatedGbw, label: targetLabel('simulated GBW', simulatedGbw, 'Hz'), kind: 'mark' as const }] : []),
    ],
  });
}
