import { existsSync, readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { StackwrightError } from '../errors.js';

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

/** The include with its model file taken from the current folder (anchoredInclude), refusing a named file that does not exist. */
export function existingInclude(include: string, where: string): string {
  const anchored = anchoredInclude(include, process.cwd());
  if (anchored.path !== undefined && !existsSync(anchored.path)) throw new StackwrightError('model file not found', { where: `${where} ${include.trim()}` });
  return anchored.include;
}

/** A model file given by path (`where` names the flag): its absolute path and library sections; throws when it does not exist. */
export function modelFile(text: string, where: string): { path: string; sections: string[] } {
  const path = resolve(text);
  if (!existsSync(path)) throw new StackwrightError('model file not found', { where: `${where} ${text}` });
  return { path, sections: librarySections(readFileSync(path, 'utf8')) };
}

/** Names of the library sections a model file defines (`.lib NAME` lines with one word). */
export function librarySections(text: string): string[] {
  const out: string[] = [];
  for (const m of text.matchAll(/^[ \t]*\.lib[ \t]+([^\s'"]+)[ \t]*$/gim)) out.push(m[1]);
  return out;
}

/**
 * The model line of a deck written for one corner from `--include` (`where`): a literal
 * `.lib`/`.include` line as written, its file made absolute (anchoredInclude); a model file by its absolute path, so the deck runs
 * from any folder, as `.lib 'FILE' CORNER` when the file has library sections (ngspice
 * reads such a file only through `.lib`; an `.include` of it fails on its `.lib` lines),
 * else as `.include 'FILE'`. Throws for a missing file or a corner without a section.
 */
export function modelLine(include: string, corner: string | undefined, where: string): string {
  const text = include.trim();
  if (text.startsWith('.')) return anchoredInclude(text, process.cwd()).include;
  const { path, sections: have } = modelFile(text, where);
  if (have.length === 0) return `.include '${path}'`;
  if (corner === undefined || !have.includes(corner)) {
    const which = corner === undefined ? 'the result names no corner to pick a library section by' : `no library section "${corner}" (the result's nominal corner)`;
    throw new StackwrightError(`${which} (has ${have.join(', ')}); give the line itself, e.g. ${where} ".lib '${path}' ${have[0]}"`, { where: `${where} ${text}` });
  }
  return `.lib '${path}' ${corner}`;
}
