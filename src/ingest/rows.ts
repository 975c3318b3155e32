import Papa from 'papaparse';
import type { Delimiter } from './delimiter.js';
import { splitBlanks } from './delimiter.js';

/**
 * Call `row(fields, line)` for every physical line (1-based), header and
 * comments included. Delimited text goes through papaparse (one row per line
 * as long as no quoted cell spans lines); blank-separated text is split here.
 */
export function forEachRow(text: string, delimiter: Delimiter, row: (fields: string[], line: number) => void): void {
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
  const newline = text.includes('\r\n') ? '\r\n' : '\n';
  let line = 1;
  const parse = (piece: string) =>
    Papa.parse<string[]>(piece, {
      delimiter,
      newline,
      header: false,
      dynamicTyping: false,
      skipEmptyLines: false,
      step: (results) => row(results.data, line++),
    });
  // Quoted cells may span lines: parse those files whole.
  if (text.includes('"')) {
    parse(text);
    return;
  }
  // Pieces of whole lines keep papaparse's line array small, so the rows die young
  // instead of piling up in the old generation (peak memory of a 1M-row file).
  let start = 0;
  while (start < text.length) {
    let end = text.indexOf('\n', Math.min(start + PIECE, text.length - 1));
    end = end < 0 ? text.length : end + 1;
    const piece = text.slice(start, end);
    if (end === text.length) parse(piece);
    else parse(piece.slice(0, piece.length - (piece.endsWith(newline) ? newline.length : 1)));
    start = end;
  }
}

const PIECE = 1 << 20;
