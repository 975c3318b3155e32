import type { BenchRow } from './result.js';

/** Numbers to 3 significant digits, large ones with thousands separators. */
export function num(x: number | null): string {
  if (x === null || !Number.isFinite(x)) return '-';
  if (Math.abs(x) >= 1000) return Math.round(x).toLocaleString('en-US');
  return Number(x.toPrecision(3)).toString();
}

/** Plain-text table of the results, columns padded to their widest cell. */
export function renderRows(rows: readonly BenchRow[]): string {
  const head = ['section', 'measured', 'unit', 'baseline', 'ours', 'ratio', 'target', 'result'];
  const body = rows.map((r) => [
    r.section,
    r.measured,
    r.unit,
    r.baseline === null ? '-' : `${num(r.baseline)} (${r.baselineLabel})`,
    num(r.ours),
    r.ratio === null ? '-' : `${num(r.ratio)}x`,
    r.target,
    r.status,
  ]);
  const all = [head, ...body];
  const widths = head.map((_, c) => Math.max(...all.map((row) => row[c].length)));
  const line = (cells: string[]) => cells.map((s, c) => s.padEnd(widths[c])).join('  ').trimEnd();
  const out = [line(head), widths.map((w) => '-'.repeat(w)).join('  '), ...body.map(line)];
  const notes = rows.filter((r) => r.note).map((r) => `  [${r.section}] ${r.measured}: ${r.note}`);
  return [...out, ...(notes.length ? ['', 'notes:', ...notes] : [])].join('\n');
}
