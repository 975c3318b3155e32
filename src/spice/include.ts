import { resolve } from 'node:path';

/**
 * Model include line for a deck: text starting with "." is used verbatim
 * (e.g. `.lib '/pdk/models.lib' tt`), anything else is taken as a file path.
 */
export function includeLines(include: string | undefined): string[] {
  if (include === undefined || include.trim() === '') return [];
  const text = include.trim();
  if (text.startsWith('.')) return text.split(/\r?\n/);
  return [`.include '${text}'`];
}

/**
 * The include with its model file taken from `cwd`, for a deck that ngspice runs in a folder of its own: a path,
 * or the path of a literal `.lib`/`.include` line, made absolute; `path` is that file (undefined when a literal
 * line names none).
 */
export function anchoredInclude(include: string, cwd: string): { include: string; path?: string } {
  const text = include.trim();
  if (!text.startsWith('.')) {
    const path = resolve(cwd, text);
    return { include: path, path };
  }
  const m = /^(\.(?:lib|include|inc))[ \t]+(?:'([^']*)'|"([^"]*)"|([^\s'"]+))(.*)$/is.exec(text);
  if (!m) return { include: text };
  const path = resolve(cwd, m[2] ?? m[3] ?? m[4]);
  return { include: `${m[1]} '${path}'${m[5]}`, path };
}
