import Papa from 'papaparse';
import type { Delimiter } from './delimiter.js';
import { splitBlanks } from './delimiter.js';
import { forEachQuotedRow, type CellPlaces } from './quoted.js';

/**
 * Call `row(fields, line, places)` for every record, header and comments
 * included; `line` is the 1-based physical line the record starts on. `places`
 * (line and column of each cell) is given only for text with quotes, where a
 * record may span lines; otherwise a record is one line. LF and CRLF line ends
 * may be mixed (files joined from two systems): lines split at LF and a CR
 * before it is dropped.
 */
export function forEachRow(
  text: string,
  delimiter: Delimiter,
  file: string,
  row: (fields: string[], line: number, places?: CellPlaces) => void,
): void {
  if (delimiter === 'space') {
    let start = 0;
    let line = 1;
    while (start < text.length) {
      let end = text.indexOf('\n', start);
      if (end < 0) end = text.length;
      row(splitBlanks(text.slice(start, end)), line++);
      start = end + 1;
    }
    return;
  }
  if (text.includes('"')) {
    forEachQuotedRow(text, delimiter, file, row);
    return;
  }
  let line = 1;
  const parse = (piece: string) =>
    Papa.parse<string[]>(piece, {
      delimiter,
      newline: '\n',
      header: false,
      dynamicTyping: false,
      skipEmptyLines: false,
      step: (results) => {
        const fields = results.data;
        const k = fields.length - 1;
        const last = fields[k];
        if (last.charCodeAt(last.length - 1) === 13) fields[k] = last.slice(0, -1);
        row(fields, line++);
      },
    });
  // Pieces of whole lines keep papaparse's line array small, so the rows die young
  // instead of piling up in the old generation (peak memory of a 1M-row file).
  let start = 0;
  while (start < text.length) {
    let end = text.indexOf('\n', Math.min(start + PIECE, text.length - 1));
    end = end < 0 ? text.length : end + 1;
    const piece = text.slice(start, end);
    if (end === text.length) parse(piece);
    else parse(piece.slice(0, piece.length - 1));
    start = end;
  }
}

const PIECE = 1 << 20;
