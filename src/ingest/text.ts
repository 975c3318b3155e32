import { createHash } from 'node:crypto';
import { gunzipSync } from 'node:zlib';
import { StackwrightError } from '../errors.js';

export interface Decoded {
  text: string;
  sha256: string;
}

/** Bytes or text to a string: gunzip when the gzip magic is present, drop a UTF-8 BOM. */
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
  let text = typeof raw === 'string' ? raw : raw.toString('utf8');
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  return { text, sha256 };
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
