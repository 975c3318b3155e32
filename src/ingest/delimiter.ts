/** ',' ';' '\t', or 'space' for runs of blanks (SPICE print/wrdata style). */
export type Delimiter = ',' | ';' | '\t' | 'space';

/** Pick the delimiter from the header line: the first of , ; tab that occurs, else whitespace runs. */
export function detectDelimiter(header: string): Delimiter {
  if (header.includes(',')) return ',';
  if (header.includes(';')) return ';';
  if (header.includes('\t')) return '\t';
  return 'space';
}

/** Split a line on runs of blanks; papaparse cannot express a run as one delimiter. */
export function splitBlanks(line: string): string[] {
  const t = line.trim();
  return t === '' ? [''] : t.split(/[ \t]+/);
}

/**
 * 1-based character column where cell `index` starts in `line`. Used for text
 * without quotes; quoted text gets exact cell places from forEachQuotedRow.
 */
export function cellColumn(line: string, delimiter: Delimiter, index: number): number {
  if (delimiter === 'space') {
    const re = /[^ \t]+/g;
    let m: RegExpExecArray | null;
    let k = 0;
    while ((m = re.exec(line)) !== null) {
      if (k++ === index) return m.index + 1;
    }
    return line.length + 1;
  }
  let k = 0;
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    if (k === index) return i + 1;
    const c = line[i];
    if (c === '"') quoted = !quoted;
    else if (c === delimiter && !quoted) {
      k++;
      if (k === index) return i + 2;
    }
  }
  return line.length + 1;
}
