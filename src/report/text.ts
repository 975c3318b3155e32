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
  /** Per row: a longer explanation printed on its own line(s) under the row, wrapped to `width`. */
  notes?: Array<string | undefined>;
  /** Per row: drawn bold (on a colour terminal) and marked with ▸ in front. */
  highlight?: boolean[];
  /** Line width the notes wrap to (default TEXT_WIDTH). */
  width?: number;
}

/** Widest line the text output aims for: fits a 120-column terminal. */
export const TEXT_WIDTH = 120;

/** Words of `text` in lines of at most `width` columns, each starting with `indent` (a longer word stays whole). */
export function wrapText(text: string, width = TEXT_WIDTH, indent = ''): string {
  const lines: string[] = [];
  let cur = '';
  for (const word of text.split(/\s+/).filter(Boolean)) {
    if (cur && displayWidth(indent + cur + ' ' + word) > width) {
      lines.push(indent + cur);
      cur = word;
    } else cur = cur ? `${cur} ${word}` : word;
  }
  if (cur || lines.length === 0) lines.push(indent + cur);
  return lines.join('\n');
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
  const marks = opts.highlight?.some(Boolean) ?? false;
  // A highlighted row starts with ▸; the others with two spaces, so columns stay aligned.
  const lead = (k: number | undefined): string => (!marks ? '' : k !== undefined && opts.highlight?.[k] ? '▸ ' : '  ');
  const line = (cells: string[], k?: number): string => indent + lead(k) + cells.map((s, c) => pad(s, widths[c], align[c])).join(gap);
  const head = line(headers.map((h) => ansi.bold(h, opts.color ?? false)));
  const rule = indent + (marks ? '  ' : '') + widths.map((w) => '─'.repeat(w)).join(gap);
  const body = rows.flatMap((r, k) => {
    const text = line(r, k);
    const out = [opts.highlight?.[k] ? ansi.bold(text, opts.color ?? false) : text];
    const note = opts.notes?.[k];
    if (note) out.push(wrapText(note, opts.width ?? TEXT_WIDTH, indent + (marks ? '  ' : '') + '    '));
    return out;
  });
  return [head, rule, ...body].join('\n');
}
