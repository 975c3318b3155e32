import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { StackwrightError } from '../errors.js';
import { packageRoot } from '../table/locate.js';

export { packageRoot, tablesDirFor } from '../table/locate.js';

/** Colour only on a TTY and never with NO_COLOR (https://no-color.org). */
export function useColor(stream: NodeJS.WriteStream = process.stdout): boolean {
  return Boolean(stream.isTTY) && !('NO_COLOR' in process.env) && process.env.TERM !== 'dumb';
}

/** Data goes to stdout. */
export function out(text: string): void {
  process.stdout.write(text.endsWith('\n') ? text : text + '\n');
}

/** Messages go to stderr. */
export function note(text: string): void {
  process.stderr.write(text.endsWith('\n') ? text : text + '\n');
}

/** JSON with non-finite numbers as null (JSON has no Infinity). */
export function toJson(value: unknown): string {
  return JSON.stringify(value, (_k, v) => (typeof v === 'number' && !Number.isFinite(v) ? null : v), 2);
}

export function readText(path: string, what = 'file'): string {
  try {
    return readFileSync(path, 'utf8');
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new StackwrightError(code === 'ENOENT' ? `${what} not found` : `cannot read ${what}: ${(e as Error).message}`, { where: path });
  }
}

export function packageVersion(): string {
  try {
    return JSON.parse(readFileSync(join(packageRoot(), 'package.json'), 'utf8')).version as string;
  } catch {
    return '0.0.0';
  }
}
