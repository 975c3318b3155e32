import type { PortRun } from '../solve/port.js';
import { formatEng } from '../units/index.js';
import { renderTable } from './text.js';
import { formatArea, formatHeadroom, formatPercent } from './format.js';
import { verdictText } from './verdict.js';
import { harderLine, stageHarderLine } from './port-harder.js';
import { stageVerdictText } from './stage-rows.js';

function value(x: number, unit: string): string {
  if (Number.isNaN(x)) return '—';
  if (!Number.isFinite(x)) return 'never';
  if (unit === 'm²') return formatArea(x);
  if (unit === '1/V') return `${Number(x.toPrecision(3))} /V`;
  if (unit === '') return formatPercent(x); // σ, as verdicts show it
  return formatEng(x, unit);
}

/** `port` as text: per stack, old against new with the change in percent, then what got harder. */
export function renderPortText(run: PortRun, opts: { color: boolean }): string {
  const from = run.from.result.kit;
  const to = run.to.result.kit;
  const bold = (s: string): string => (opts.color ? `\x1b[1m${s}\x1b[0m` : s);
  const lines = [`port ${from} -> ${to}, corners ${run.to.result.corners.join(', ')}`, `CAUTION: ${run.to.result.caution}`];
  for (const n of run.notes) lines.push(`note: ${n}`);
  for (const s of run.stacks) {
    lines.push('', bold(`stack ${s.name}: ${s.from.topology} on ${from} -> ${s.to.topology} on ${to} — ${s.to.feasible ? 'FEASIBLE' : 'INFEASIBLE'}`));
    const rows = s.changes.map((c) => [
      c.what, c.what === 'headroom' ? formatHeadroom(c.from) : value(c.from, c.unit), c.what === 'headroom' ? formatHeadroom(c.to) : value(c.to, c.unit), Number.isFinite(c.percent) ? `${c.percent >= 0 ? '+' : ''}${c.percent.toFixed(1)} %` : '—',
    ]);
    lines.push(renderTable(['quantity', from, to, 'change'], rows, { indent: 2 }));
    lines.push(`  harder on ${to}: ${harderLine(s.harder, (s.to.corners?.length ?? 0) > 1)}`);
    if ('error' in s.asIs) lines.push(`  old sizes as they are on ${to}: cannot be evaluated (${s.asIs.error})`);
    else {
      const p = s.asIs.predicted;
      lines.push(`  old sizes as they are on ${to}: Iout ${value(p.iout, 'A')}, Rout ${value(p.rout, 'Ω')}, headroom ${formatHeadroom(p.headroom)} — ${s.asIs.feasible ? 'still meets the targets' : `fails (${s.asIs.binding ? verdictText(s.asIs.binding) : 'targets'})`}`);
    }
  }
  for (const s of run.stages) {
    lines.push('', bold(`stage ${s.name}: ${s.from.load.topology} load on ${from} -> ${s.to.load.topology} load on ${to} — ${s.to.feasible ? 'FEASIBLE' : 'INFEASIBLE'}`));
    const rows = s.changes.map((c) => [
      c.what, c.unit === 'V/V' ? (Number.isFinite(c.from) ? Number(c.from.toPrecision(4)).toString() : '—') : value(c.from, c.unit),
      c.unit === 'V/V' ? (Number.isFinite(c.to) ? Number(c.to.toPrecision(4)).toString() : '—') : value(c.to, c.unit),
      Number.isFinite(c.percent) ? `${c.percent >= 0 ? '+' : ''}${c.percent.toFixed(1)} %` : '—',
    ]);
    lines.push(renderTable(['quantity', from, to, 'change'], rows, { indent: 2 }));
    lines.push(`  harder on ${to}: ${stageHarderLine(s.harder, (s.to.corners?.length ?? 0) > 1)}`);
    if ('error' in s.asIs) lines.push(`  old sizes as they are on ${to}: cannot be evaluated (${s.asIs.error})`);
    else {
      const p = s.asIs.predicted;
      const v = s.asIs.binding ?? s.asIs.tightest;
      lines.push(`  old sizes as they are on ${to}: gain ${Number(p.gain.toPrecision(4))}, swing ${value(p.swing, 'V')} — ${s.asIs.feasible ? 'still meets the targets' : `fails (${v ? stageVerdictText(v, run.to.result.corners.length > 1) : 'targets'})`}`);
    }
  }
  return lines.join('\n');
}
