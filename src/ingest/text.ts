import { isUtf8 } from 'node:buffer';
import { createHash } from 'node:crypto';
import { gunzipSync } from 'node:zlib';
import { StackwrightError } from '../errors.js';

export interface Decoded {
  text: string;
  sha256: string;
}

/**
 * Input as UTF-8 bytes when it is UTF-8 (gunzipped when gzip; `start` skips a
 * UTF-8 BOM), else as text (UTF-16 decoded by its BOM). The digest is of the raw input.
 */
export function decodeInput(input: string | Buffer, file: string): { sha256: string } & ({ bytes: Buffer; start: number; text?: undefined } | { text: string; bytes?: undefined }) {
  if (typeof input === 'string') return decode(input, file);
  const sha256 = createHash('sha256').update(input).digest('hex');
  let bytes = input;
  if (bytes.length >= 2 && bytes[0] === 0x1f && bytes[1] === 0x8b) {
    try {
      bytes = gunzipSync(bytes);
    } catch (e) {
      throw new StackwrightError(`cannot gunzip: ${(e as Error).message.split('\n')[0]}`, { where: file });
    }
  }
  const utf16or32 = bytes.length >= 2 && ((bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff) || (bytes[0] === 0 && bytes[1] === 0));
  const nul = bytes.subarray(0, 64).indexOf(0) >= 0;
  if (utf16or32 || nul) return { text: stripBom(bytesToText(bytes, file)), sha256 };
  checkUtf8(bytes, file);
  const bom = bytes.length >= 3 && bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf;
  return { bytes, start: bom ? 3 : 0, sha256 };
}

const stripBom = (t: string) => (t.charCodeAt(0) === 0xfeff ? t.slice(1) : t);

/** Bytes or text to a string: gunzip when the gzip magic is present, decode UTF-16 by its BOM, drop a BOM. */
export function decode(input: string | Buffer, file: string): Decoded {
  const bytes = typeof input === 'string' ? Buffer.from(input, 'utf8') : input;
  const sha256 = createHash('sha256').update(bytes).digest('hex');
  let raw: Buffer | string = input;
  if (bytes.length >= 2 && bytes[0] === 0x1f && bytes[1] === 0x8b) {
    try {
      raw = gunzipSync(bytes);
    } catch (e) {
      throw new StackwrightError(`cannot gunzip: ${(e as Error).message.split('\n')[0]}`, { where: file });
    }
  }
  let text = typeof raw === 'string' ? raw : bytesToText(raw, file);
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  return { text, sha256 };
}

/**
 * UTF-8 (with or without BOM) as is; UTF-16 recognised by its byte-order mark
 * (FF FE little-endian, FE FF big-endian; Unicode Standard, section 23.8) and
 * decoded. UTF-32 and BOM-less UTF-16 (NUL bytes between ASCII) are refused by
 * name, since reading them as UTF-8 gives garbled headers.
 */
export function bytesToText(b: Buffer, file: string): string {
  if (b.length >= 4 && b[0] === 0xff && b[1] === 0xfe && b[2] === 0 && b[3] === 0) throw encodingError('UTF-32 (little-endian)', file);
  if (b.length >= 4 && b[0] === 0 && b[1] === 0 && b[2] === 0xfe && b[3] === 0xff) throw encodingError('UTF-32 (big-endian)', file);
  if (b.length >= 2 && b[0] === 0xff && b[1] === 0xfe) return utf16(b.subarray(2), file, 'UTF-16 (little-endian)');
  if (b.length >= 2 && b[0] === 0xfe && b[1] === 0xff) {
    const body = Buffer.from(b.subarray(2));
    if (body.length % 2 !== 0) throw new StackwrightError('UTF-16 (big-endian) text with an odd number of bytes: the file is cut short', { where: file });
    body.swap16();
    return utf16(body, file, 'UTF-16 (big-endian)');
  }
  const head = b.subarray(0, 64);
  if (head.length >= 4 && head.indexOf(0) >= 0) {
    const evenNul = head[1] === 0 && head[3] === 0;
    const oddNul = head[0] === 0 && head[2] === 0;
    if (evenNul || oddNul) throw encodingError(`UTF-16 without a byte-order mark (${evenNul ? 'little' : 'big'}-endian by its NUL bytes)`, file);
    throw new StackwrightError('binary data (NUL bytes) in the first line: not a text sweep file', { where: file });
  }
  checkUtf8(b, file);
  return b.toString('utf8');
}

/**
 * Bytes that are not UTF-8 (a Windows tool's Latin-1 / Windows-1252 "µA" header) are refused at the first bad
 * byte: decoded anyway they turn into U+FFFD and the message blames the wrong thing.
 */
function checkUtf8(b: Buffer, file: string): void {
  if (isUtf8(b)) return;
  const off = firstBadUtf8(b);
  const lineStart = b.lastIndexOf(10, off - 1) + 1;
  let line = 1;
  for (let i = b.indexOf(10); i >= 0 && i < off; i = b.indexOf(10, i + 1)) line++;
  const column = b.toString('utf8', lineStart, off).length + 1;
  const byte = b[off].toString(16).toUpperCase().padStart(2, '0');
  throw new StackwrightError(`the file is not UTF-8 text (byte 0x${byte} here; Latin-1 or Windows-1252?); save it as UTF-8 (or UTF-16 with a byte-order mark)`, {
    where: `${file}:${line}:${column}`,
  });
}

/** Offset of the first byte that breaks UTF-8's lead/continuation structure (Unicode Standard, table 3-7). */
function firstBadUtf8(b: Buffer): number {
  for (let i = 0; i < b.length; ) {
    const c = b[i];
    const n = c < 0x80 ? 0 : c >= 0xc2 && c <= 0xdf ? 1 : c >= 0xe0 && c <= 0xef ? 2 : c >= 0xf0 && c <= 0xf4 ? 3 : -1;
    if (n < 0) return i;
    for (let k = 1; k <= n; k++) if (i + k >= b.length || (b[i + k] & 0xc0) !== 0x80) return i;
    i += n + 1;
  }
  return 0; // valid structure but refused (an overlong or surrogate form): point at the start
}

function utf16(body: Buffer, file: string, name: string): string {
  if (body.length % 2 !== 0) throw new StackwrightError(`${name} text with an odd number of bytes: the file is cut short`, { where: file });
  return body.toString('utf16le');
}

function encodingError(name: string, file: string): StackwrightError {
  return new StackwrightError(`the file is ${name} text; save it as UTF-8 (or UTF-16 with a byte-order mark)`, { where: file });
}

export function isCommentOrBlank(line: string): boolean {
  const t = line.trimStart();
  return t === '' || t[0] === '#' || t[0] === '*';
}

/** First line that is not blank or a comment: its 1-based number and text. */
export function findHeader(text: string): { line: number; text: string } | undefined {
  let start = 0;
  let line = 1;
  while (start <= text.length) {
    let end = text.indexOf('\n', start);
    if (end < 0) end = text.length;
    const s = text.slice(start, end).replace(/\r$/, '');
    if (!isCommentOrBlank(s)) return { line, text: s };
    start = end + 1;
    line++;
  }
  return undefined;
}

/** Text of 1-based physical line n (for messages only). */
export function lineAt(text: string, n: number): string {
  let start = 0;
  for (let i = 1; i < n; i++) {
    const next = text.indexOf('\n', start);
    if (next < 0) return '';
    start = next + 1;
  }
  const end = text.indexOf('\n', start);
  return text.slice(start, end < 0 ? text.length : end).replace(/\r$/, '');
}

export function countLines(text: string): number {
  let n = 0;
  for (let i = text.indexOf('\n'); i >= 0; i = text.indexOf('\n', i + 1)) n++;
  return text.length > 0 && text[text.length - 1] !== '\n' ? n + 1 : n;
}

/**
 * Lines that end in CR alone (classic Mac OS; a spreadsheet's "Macintosh" CSV) would read as one long header line:
 * refused by name when the text has no LF but a CR with more text after it.
 */
export function checkLineEnds(t: { indexOf(v: number | string, from?: number): number; length: number }, lf: number | string, cr: number | string, start: number, file: string): void {
  if (t.indexOf(lf, start) >= 0) return;
  const at = t.indexOf(cr, start);
  if (at >= 0 && at < t.length - 1) {
    throw new StackwrightError('lines end in CR alone (classic Mac OS line ends); save the file with LF or CR LF line ends', { where: file });
  }
}
