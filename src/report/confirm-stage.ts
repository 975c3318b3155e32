import type { StageSpec } from '../design/types.js';
import type { StageResult } from '../solve/stage-types.js';
import type { StageConfirmation } from '../confirm/stage-types.js';
import { eng, formatArea } from './format.js';
import type { Grid } from './rows.js';

const gainText = (x: number) => (Number.isFinite(x) ? String(Number(x.toPrecision(4))) : '—');
const volts = (x: number | null) => (x === null ? '—' : eng(x, 'V'));

/** A stage's targets, table prediction and simulation side by side, one column pair per simulated corner. */
export function stageConfirmGrid(c: StageConfirmation, stage: StageResult | undefined, spec: StageSpec | undefined): Grid {
  const corners = c.simulated.corners;
  const predictedAt = (corner: string) => stage?.corners?.find((x) => x.corner === corner)?.predicted ?? (corner === corners[0].corner ? stage?.predicted : undefined);
  type Figures = { gain: number; vlow: number | null; vhigh: number | null; swing: number; vin: number; gbw: number | null };
  const row = (label: string, target: string, pick: (x: Figures) => string) => [
    label, target, ...corners.flatMap((f) => {
      const p = predictedAt(f.corner);
      return [p ? pick(p) : '—', pick(f)];
    }),
  ];
  return {
    headers: ['', 'target', ...corners.flatMap((f) => [`predicted ${f.corner}`, `simulated ${f.corner}`])],
    rows: [
      row('gain at the design point', spec ? `≥ ${gainText(spec.gain)} at ${eng(spec.output, 'V')}` : '—', (x) => gainText(x.gain)),
      row('swing (gain ≥ target)', spec ? `≥ ${eng(spec.swing, 'V')}` : '—', (x) => eng(x.swing, 'V')),
      row('vlow', '', (x) => volts(x.vlow)),
      row('vhigh', '', (x) => volts(x.vhigh)),
      row('input DC voltage', '', (x) => eng(x.vin, 'V')),
      // Predicted: gm_in / (2π (cap + C_out)) from the tables; simulated: the unity-gain frequency of |vout/vin| (AC).
      ...(spec?.gbw !== undefined ? [row('GBW (unity-gain frequency)', `≥ ${eng(spec.gbw, 'Hz')} with ${eng(spec.cap ?? 0, 'F')}`, (x) => (x.gbw === null ? '—' : eng(x.gbw, 'Hz')))] : []),
    ],
  };
}

/** A corrected stage's widths against the table design's. */
export function stageCorrectedGrid(c: StageConfirmation, stage: StageResult | undefined): Grid | undefined {
  if (!c.corrected || !stage) return undefined;
  const change = (a: number, b: number) => `${b >= a ? '+' : ''}${Number((100 * (b / a - 1)).toFixed(1))} %`;
  const rows: string[][] = [];
  for (const kind of ['input', 'load'] as const) {
    const was = stage[kind];
    const now = c.corrected[kind];
    now.devices.forEach((d, k) => rows.push([`${kind} ${d.role}`, eng(was.devices[k]?.w ?? NaN, 'm'), eng(d.w, 'm'), was.devices[k] ? change(was.devices[k].w, d.w) : '—', eng(d.l, 'm')]));
    now.bias.forEach((b, k) => rows.push([`${kind} bias for ${b.drives}`, eng(was.bias[k]?.w ?? NaN, 'm'), eng(b.w, 'm'), was.bias[k] ? change(was.bias[k].w, b.w) : '—', eng(b.l, 'm')]));
  }
  rows.push(['area (output devices)', formatArea(stage.predicted.area), formatArea(c.corrected.area), change(stage.predicted.area, c.corrected.area), '']);
  return { headers: ['device', 'W (tables)', 'W (corrected)', 'change', 'L'], rows };
}
