import { StackwrightError } from '../errors.js';

export type Align = 'left' | 'right';

export interface TableOptions {
  /** Per column; default: left for the first column, right for the rest (numbers). */
  align?: Align[];
  /** Bold headers via ANSI SGR codes; off unless the CLI decides the terminal wants it. */
  color?: boolean;
  /** Spaces between columns. */
  gap?: number;
  /** Indent of every line. */
  indent?: number;
}

// ECMA-48 SGR sequences: ESC [ n m.
const SGR = /\u001b\[[0-9;]*m/g;

export const ansi = {
  bold: (s: string, on: boolean): string => (on ? `\u001b[1m${s}\u001b[22m` : s),
  dim: (s: string, on: boolean): string => (on ? `\u001b[2m${s}\u001b[22m` : s),
  green: (s: string, on: boolean): string => (on ? `\u001b[32m${s}\u001b[39m` : s),
  red: (s: string, on: boolean): string => (on ? `\u001b[31m${s}\u001b[39m` : s),
  yellow: (s: string, on: boolean): string => (on ? `\u001b[33m${s}\u001b[39m` : s),
};

export function stripAnsi(s: string): string {
  return s.replace(SGR, '');
}

/** Width in terminal columns: code points, not UTF-16 units (µ, Ω, ² are one column), colour codes excluded. */
export function displayWidth(s: string): number {
  return [...stripAnsi(s)].length;
}

function pad(s: string, width: number, align: Align): string {
  const fill = ' '.repeat(Math.max(0, width - displayWidth(s)));
  return align === 'right' ? fill + s : s + fill;
}

/**
 * A fixed-width table: header, rule, rows. Every line has the same width so
 * columns line up in any monospace terminal.
 */
export function renderTable(headers: string[], rows: string[][], opts: TableOptions = {}): string {
  const n = headers.length;
  rows.forEach((r, i) => {
    if (r.length !== n) throw new StackwrightError(`row ${i + 1} has ${r.length} cells, the header has ${n}`, { kind: 'internal', where: 'renderTable' });
  });
  const align = headers.map((_, c) => opts.align?.[c] ?? (c === 0 ? 'left' : 'right'));
  const widths = headers.map((h, c) => Math.max(displayWidth(h), ...rows.map((r) => displayWidth(r[c]))));
  const gap = ' '.repeat(opts.gap ?? 2);
  const indent = ' '.repeat(opts.indent ?? 0);
  const line = (cells: string[]): string => indent + cells.map((s, c) => pad(s, widths[c], align[c])).join(gap);
  const head = line(headers.map((h) => ansi.bold(h, opts.color ?? false)));
  const rule = indent + widths.map((w) => '─'.repeat(w)).join(gap);
  return [head, rule, ...rows.map(line)].join('\n');
}
