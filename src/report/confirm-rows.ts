import type { DesignSpec, StackSpec } from '../design/types.js';
import type { StackResult } from '../solve/types.js';
import type { Confirmation, Miss } from '../confirm/types.js';
import { eng, formatArea, formatHeadroom } from './format.js';
import type { Grid } from './rows.js';

/** One miss in words: "headroom at ss: needs ≤ 450 mV, simulated 470 mV". */
export function missWords(m: Miss): string {
  if (m.target === 'gain') return `gain at ${m.corner}: needs ≥ ${num(m.required)} at ${eng(m.at ?? NaN, 'V')}, simulated ${m.achieved === null ? 'none' : num(m.achieved)}`;
  if (m.target === 'gbw') return `GBW at ${m.corner}: needs ≥ ${eng(m.required, 'Hz')} (unity-gain frequency with the load cap), simulated ${m.achieved === null ? 'no fall to unity gain below 1 THz' : eng(m.achieved, 'Hz')}`;
  if (m.target === 'swing') return `swing at ${m.corner}: needs ≥ ${eng(m.required, 'V')} with the gain target held, simulated ${m.achieved === null ? 'none' : eng(m.achieved, 'V')}`;
  const unit = m.target === 'iout' ? 'A' : m.target === 'rout' ? 'Ω' : 'V';
  // A headroom miss comes rounded up to the whole mV from the confirmation (a 500.3 mV miss must not read "500 mV").
  const got = m.achieved;
  const need = m.target === 'iout' ? `${eng(m.required, unit)} ± 1 %` : `${m.target === 'rout' ? '≥' : '≤'} ${eng(m.required, unit)}`;
  const where = m.target === 'rout' && m.at !== null ? ` (lowest at ${eng(m.at, 'V')})` : '';
  return `${m.target} at ${m.corner}: needs ${need}, simulated ${got === null ? 'never' : m.target === 'headroom' ? formatHeadroom(got) : eng(got, unit)}${where}`;
}

/** A gain (V/V) with four significant digits. */
const num = (x: number) => (Number.isFinite(x) ? String(Number(x.toPrecision(4))) : '—');

/** The verdict of a confirmation in one line. */
export function confirmVerdict(c: { rounds: number; confirmed: boolean; corrected?: unknown; tightened?: boolean; misses: readonly Miss[] }): string {
  const rounds = `${c.rounds} simulated round${c.rounds === 1 ? '' : 's'}`;
  if (c.confirmed) {
    if (!c.corrected) return `confirmed in simulation: the table design meets every target (${rounds})`;
    return c.tightened ? `confirmed in simulation, then shrunk to a smaller design that meets every target too (${rounds})` : `confirmed in simulation after correction (${rounds})`;
  }
  const worst = c.misses[0];
  return `NOT confirmed in simulation after ${rounds}${worst ? `: ${c.misses.map(missWords).join('; ')}` : ''}`;
}

/** Targets, table prediction and simulation side by side, one column per simulated corner. */
export function confirmGrid(c: Confirmation, stack: StackResult | undefined, spec: StackSpec | undefined): Grid {
  const corners = c.simulated.corners;
  const predictedAt = (corner: string) => stack?.corners?.find((x) => x.corner === corner)?.predicted ?? (corner === corners[0].corner ? stack?.predicted : undefined);
  // Predicted is the table design's; simulated is the last design simulated (the corrected one when correction ran).
  const after = c.corrected ? ' (corrected)' : '';
  const headers = ['', 'target', ...corners.flatMap((f) => [`predicted ${f.corner}`, `simulated ${f.corner}${after}`])];
  const row = (label: string, target: string, pick: (x: { iout: number; rout: number; headroom: number }) => string) => [
    label, target, ...corners.flatMap((f) => {
      const p = predictedAt(f.corner);
      return [p ? pick(p) : '—', pick(f)];
    }),
  ];
  return {
    headers,
    rows: [
      row('Iout at mid-span', spec ? eng(spec.current, 'A') : '—', (x) => eng(x.iout, 'A')),
      row('lowest Rout over span', spec ? `≥ ${eng(spec.rout, 'Ω')}` : '—', (x) => eng(x.rout, 'Ω')),
      row('headroom', spec ? `≤ ${eng(spec.headroom, 'V')}` : '—', (x) => formatHeadroom(x.headroom)),
    ],
  };
}

/** Sizes before and after correction. */
export function correctedGrid(c: Confirmation, stack: StackResult | undefined): Grid | undefined {
  if (!c.corrected || !stack) return undefined;
  const change = (a: number, b: number) => `${b >= a ? '+' : ''}${Number((100 * (b / a - 1)).toFixed(1))} %`;
  const rows = c.corrected.devices.map((d, k) => {
    const was = stack.devices[k];
    return [d.role, eng(was?.w ?? NaN, 'm'), eng(d.w, 'm'), was ? change(was.w, d.w) : '—', eng(d.l, 'm'), eng(d.gate, 'V')];
  });
  c.corrected.bias.forEach((b, k) => {
    const was = stack.bias[k];
    rows.push([`bias for ${b.drives}`, eng(was?.w ?? NaN, 'm'), eng(b.w, 'm'), was ? change(was.w, b.w) : '—', eng(b.l, 'm'), eng(b.voltage, 'V')]);
  });
  rows.push(['output-stack area', formatArea(stack.predicted.area), formatArea(c.corrected.area), change(stack.predicted.area, c.corrected.area), '', '']);
  return { headers: ['device', 'W (tables)', 'W (corrected)', 'change', 'L', 'gate'], rows };
}

export function specOf(spec: DesignSpec, name: string): StackSpec | undefined {
  return spec.stacks.find((s) => s.name === name);
}
