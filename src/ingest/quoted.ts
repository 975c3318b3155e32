import { StackwrightError, at } from '../errors.js';
import { showText } from '../units/index.js';

/**
 * Where each cell of a record starts: line of cell i at [2i], 1-based column at [2i + 1].
 * Needed because a quoted cell may span lines (RFC 4180 section 2), so a record's
 * later cells can sit on later physical lines.
 */
export type CellPlaces = Int32Array;

/**
 * Split delimited text that contains double quotes into records, RFC 4180 style:
 * a quote opens a quoted cell only as the first character of a cell, `""` inside
 * one is a literal quote, and a quoted cell may hold line breaks (kept, with
 * physical line numbers tracked, rather than refused: a note column in a
 * spreadsheet export is harmless as long as the numbers are located right).
 * A quote elsewhere is an ordinary character, as in papaparse. LF and CRLF
 * line ends may be mixed. An unclosed quote is an error at the opening quote.
 */
export function forEachQuotedRow(
  text: string,
  delimiter: string,
  file: string,
  row: (fields: string[], line: number, places: CellPlaces) => void,
): void {
  const n = text.length;
  let i = 0;
  let line = 1;
  let lineStart = 0;
  while (i < n) {
    const recordLine = line;
    const fields: string[] = [];
    const places: number[] = [];
    for (;;) {
      const fieldLine = line;
      const fieldCol = i - lineStart + 1;
      let value: string;
      if (text[i] === '"') {
        let j = i + 1;
        value = '';
        for (;;) {
          const q = text.indexOf('"', j);
          if (q < 0) {
            throw new StackwrightError('unclosed quote: the quoted cell that starts here runs to the end of the file', { where: at(file, fieldLine, fieldCol) });
          }
          for (let k = text.indexOf('\n', j); k >= 0 && k < q; k = text.indexOf('\n', k + 1)) {
            line++;
            lineStart = k + 1;
          }
          if (text[q + 1] === '"') {
            value += text.slice(j, q + 1);
            j = q + 2;
            continue;
          }
          value += text.slice(j, q);
          i = q + 1;
          break;
        }
        const c = text[i];
        const ends = i >= n || c === delimiter || c === '\n' || (c === '\r' && (i + 1 === n || text[i + 1] === '\n'));
        if (!ends) {
          throw new StackwrightError(
            `unexpected ${showText(c)} after the quoted cell that starts at ${at(file, fieldLine, fieldCol)}; expected "${delimiter === '\t' ? '\\t' : delimiter}" or a line end`,
            { where: at(file, line, i - lineStart + 1) },
          );
        }
      } else {
        let j = i;
        while (j < n && text[j] !== delimiter && text[j] !== '\n') j++;
        value = text.slice(i, j < n && text[j] === '\n' && text[j - 1] === '\r' && j > i ? j - 1 : j);
        i = j;
      }
      fields.push(value);
      places.push(fieldLine, fieldCol);
      if (i < n && text[i] === delimiter) {
        i++;
        if (i < n) continue;
        fields.push(''); // a trailing delimiter at the very end of the text
        places.push(line, i - lineStart + 1);
        break;
      }
      if (i < n && text[i] === '\r') i++;
      if (i < n && text[i] === '\n') {
        i++;
        line++;
        lineStart = i;
      }
      break;
    }
    row(fields, recordLine, Int32Array.from(places));
  }
}
