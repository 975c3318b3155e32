import { LineCounter, isMap, isSeq, parseDocument, type Node as YamlNode } from 'yaml';
import { StackwrightError } from '../errors.js';
import { formatEng, parseEngShifted } from '../units/index.js';
import type { Polarity } from '../table/types.js';
import { parseStages } from './parse-stage.js';
import { topologyNames } from '../topology/index.js';
import type { DesignSpec, Objective, StackSpec, Topology } from './types.js';

const TOP_KEYS = ['kit', 'corner', 'supply', 'stacks', 'stages'];
const STACK_KEYS = ['name', 'device', 'topology', 'current', 'rout', 'headroom', 'span', 'l', 'gmid', 'objective', 'mismatch', 'bias', 'wmax'];
const OBJECTIVES: Objective[] = ['area', 'headroom', 'rout'];
/**
 * Stack names become parts of file names (`--front f.csv` writes `f.<name>.svg`), and the
 * kit name a folder, so both are kept plain: no path separators, no leading dot.
 */
export const NAME = /^[A-Za-z0-9_][A-Za-z0-9._-]{0,63}$/;
export const NAME_RULE = 'letters, digits, ".", "_" and "-", starting with a letter, digit or "_", at most 64 characters';
/** Kit names as the table files allow them (src/table/validate.ts). */
const KIT_NAME = /^[A-Za-z0-9_+][A-Za-z0-9._+-]*$/;
/**
 * Each alias may be expanded at most this many times in total. A spec has no need of
 * more, and nested aliases otherwise grow exponentially (the "billion laughs" pattern).
 */
export const MAX_ALIAS_COUNT = 100;
/** Units of the numeric keys, for messages. */
const UNIT: Record<string, string> = { supply: 'V', current: 'A', rout: 'Ω', headroom: 'V', span: 'V', bias: 'A' };

export type Path = Array<string | number>;

/** `stacks[1].rout` */
export function keyPath(path: Path): string {
  let s = '';
  for (const p of path) s += typeof p === 'number' ? `[${p}]` : s ? `.${p}` : p;
  return s || '(top level)';
}

/**
 * Parse and validate a design spec (YAML or JSON, which is YAML too).
 * Errors read `file:line:col: key.path: what was expected`.
 *
 * @example parseSpec('kit: demo180\nsupply: 1.8\nstacks: [...]', 'spec.yaml')
 */
export function parseSpec(text: string, file: string): DesignSpec {
  const lines = new LineCounter();
  const doc = parseDocument(text, { lineCounter: lines, prettyErrors: false, uniqueKeys: true });
  if (doc.errors.length > 0) {
    const e = doc.errors[0];
    const pos = e.linePos?.[0] ?? (e.pos ? lines.linePos(e.pos[0]) : undefined);
    const where = pos ? `${file}:${pos.line}:${pos.col}` : file;
    throw new StackwrightError(`not valid YAML/JSON: ${e.message.split('\n')[0]}`, { where });
  }
  let root: unknown;
  try {
    root = doc.toJS({ maxAliasCount: MAX_ALIAS_COUNT });
  } catch (e) {
    // The yaml library throws a ReferenceError when aliases expand past the cap.
    if (!(e instanceof ReferenceError)) throw e;
    throw new StackwrightError(`YAML aliases expand too far (more than ${MAX_ALIAS_COUNT} alias uses); write the values out`, { where: file });
  }

  const locate = (path: Path): string => {
    let node: unknown = doc.contents;
    let last: YamlNode | null = null;
    for (const p of path) {
      if (isMap(node) || isSeq(node)) {
        last = node as YamlNode;
        node = (node as { get(k: unknown, keep: boolean): unknown }).get(p, true);
      } else break;
    }
    const target = (node && typeof node === 'object' && 'range' in node ? node : last) as YamlNode | null;
    const offset = target?.range?.[0];
    if (offset === undefined) return `${file}: ${keyPath(path)}`;
    const { line, col } = lines.linePos(offset);
    return `${file}:${line}:${col}: ${keyPath(path)}`;
  };
  const fail = (path: Path, message: string): never => {
    throw new StackwrightError(message, { where: locate(path) });
  };

  if (!isObject(root)) fail([], 'expected a mapping with keys kit, supply, stacks');
  const top = root as Record<string, unknown>;
  checkKeys(top, TOP_KEYS, [], fail);

  const kit = requireString(top, 'kit', [], fail);
  if (!KIT_NAME.test(kit)) fail(['kit'], `kit names use letters, digits, ".", "_", "+" and "-", not starting with "." or "-"; got ${JSON.stringify(kit)}`);
  const supply = requireNumber(top, 'supply', [], fail, { positive: true });
  const corners = parseCorners(top.corner, fail);

  // A spec may hold only stages; then `stacks` may be left out.
  const stacksRaw = top.stacks === undefined && top.stages !== undefined ? [] : top.stacks;
  if (!Array.isArray(stacksRaw) || (stacksRaw.length === 0 && top.stages === undefined)) fail(['stacks'], 'expected a non-empty list of stacks');
  const names = new Set<string>();
  const stacks = (stacksRaw as unknown[]).map((raw, i) => {
    const path: Path = ['stacks', i];
    if (!isObject(raw)) fail(path, 'expected a mapping with name, device, current, rout, headroom');
    const s = raw as Record<string, unknown>;
    checkKeys(s, STACK_KEYS, path, fail);
    const stack = parseStack(s, path, supply, fail);
    if (names.has(stack.name)) fail([...path, 'name'], `duplicate stack name "${stack.name}"`);
    names.add(stack.name);
    return stack;
  });
  const out: DesignSpec = { file, kit, corners, supply, stacks };
  if (top.stages !== undefined) out.stages = parseStages(top.stages, supply, names, fail);
  return out;
}

function parseStack(s: Record<string, unknown>, path: Path, supply: number, fail: Fail): StackSpec {
  const name = requireString(s, 'name', path, fail);
  if (!NAME.test(name)) fail([...path, 'name'], `stack names use ${NAME_RULE}; got ${JSON.stringify(name)}`);
  const device = requireString(s, 'device', path, fail) as Polarity;
  if (device !== 'n' && device !== 'p') fail([...path, 'device'], `expected n (sink to ground) or p (source from supply), got "${device}"`);
  const topology = (s.topology === undefined ? 'auto' : String(s.topology)) as Topology | 'auto';
  if (topology !== 'auto' && !topologyNames().includes(topology)) {
    fail([...path, 'topology'], `expected one of ${[...topologyNames(), 'auto'].join(', ')}, got "${topology}"`);
  }
  const current = requireNumber(s, 'current', path, fail, { positive: true });
  const rout = requireNumber(s, 'rout', path, fail, { positive: true });
  const headroom = requireNumber(s, 'headroom', path, fail, { positive: true });
  const span = s.span === undefined ? supply : requireNumber(s, 'span', path, fail, { positive: true });
  if (span > supply) fail([...path, 'span'], `span ${volts(span)} exceeds the supply ${volts(supply)}`);
  if (headroom >= span) fail([...path, 'headroom'], `headroom ${volts(headroom)} must be below span ${volts(span)}`);
  const objective = (s.objective === undefined ? 'area' : String(s.objective)) as Objective;
  if (!OBJECTIVES.includes(objective)) fail([...path, 'objective'], `expected one of ${OBJECTIVES.join(', ')}, got "${objective}"`);
  const out: StackSpec = { name, device, topology, current, rout, headroom, span, objective };
  if (s.l !== undefined) out.l = parseRange(s.l, [...path, 'l'], fail, true, 'm') as StackSpec['l'];
  if (s.gmid !== undefined) {
    const g = parseRange(s.gmid, [...path, 'gmid'], fail, false, '1/V');
    out.gmid = { min: g.min, max: g.max };
  }
  if (s.mismatch !== undefined) out.mismatch = parsePercent(s.mismatch, [...path, 'mismatch'], fail);
  if (s.bias !== undefined) out.biasCurrent = requireNumber(s, 'bias', path, fail, { positive: true });
  if (s.wmax !== undefined) out.wmax = requireNumber(s, 'wmax', path, fail, { positive: true });
  return out;
}

export type Fail = (path: Path, message: string) => never;

/** A value for a message: engineering notation with its unit, 4 significant digits. */
function show(x: number, unit: string): string {
  return unit === '1/V' ? `${Number(x.toPrecision(4))} 1/V` : formatEng(x, unit, 4);
}
const volts = (x: number): string => show(x, 'V');

export function isObject(x: unknown): x is Record<string, unknown> {
  return typeof x === 'object' && x !== null && !Array.isArray(x);
}

export function checkKeys(obj: Record<string, unknown>, allowed: string[], path: Path, fail: Fail): void {
  for (const k of Object.keys(obj)) {
    if (!allowed.includes(k)) fail([...path, k], `unknown key; expected one of ${allowed.join(', ')}`);
  }
}

export function requireString(obj: Record<string, unknown>, key: string, path: Path, fail: Fail): string {
  const v = obj[key];
  if (v === undefined) return fail([...path, key], 'required key is missing');
  if (typeof v !== 'string' || v.trim() === '') return fail([...path, key], `expected a non-empty string, got ${JSON.stringify(v)}`);
  return v;
}

/** A spec number (engineering notation allowed), times 10^`shift` read exactly (a percentage: -2). */
export function number(v: unknown, path: Path, fail: Fail, shift = 0): number {
  if (typeof v !== 'number' && typeof v !== 'string') return fail(path, `expected a number (engineering notation allowed, e.g. 40u), got ${JSON.stringify(v)}`);
  try {
    return parseEngShifted(v, shift);
  } catch (e) {
    return fail(path, (e as Error).message);
  }
}

export function requireNumber(obj: Record<string, unknown>, key: string, path: Path, fail: Fail, opts: { positive?: boolean } = {}): number {
  const v = obj[key];
  if (v === undefined) return fail([...path, key], 'required key is missing');
  const x = number(v, [...path, key], fail);
  if (opts.positive && !(x > 0)) fail([...path, key], `expected a positive value, got ${show(x, UNIT[key] ?? '')}`);
  return x;
}

export function parseRange(v: unknown, path: Path, fail: Fail, allowStep: boolean, unit: string): { min: number; max: number; step?: number } {
  let min: unknown, max: unknown, step: unknown;
  if (Array.isArray(v)) {
    if (v.length !== 2 && !(allowStep && v.length === 3)) {
      fail(path, allowStep ? 'expected [min, max] or [min, max, step]' : 'expected [min, max]');
    }
    [min, max, step] = v;
  } else if (isObject(v)) {
    checkKeys(v, allowStep ? ['min', 'max', 'step'] : ['min', 'max'], path, fail);
    ({ min, max, step } = v);
    if (min === undefined) fail([...path, 'min'], 'required key is missing');
    if (max === undefined) fail([...path, 'max'], 'required key is missing');
  } else {
    return fail(path, allowStep ? 'expected [min, max], [min, max, step] or {min, max, step}' : 'expected [min, max]');
  }
  const lo = number(min, [...path, 'min'], fail);
  const hi = number(max, [...path, 'max'], fail);
  if (!(lo > 0)) fail([...path, 'min'], `expected a positive value, got ${show(lo, unit)}`);
  if (!(hi >= lo)) fail([...path, 'max'], `max ${show(hi, unit)} is below min ${show(lo, unit)}`);
  const out: { min: number; max: number; step?: number } = { min: lo, max: hi };
  if (step !== undefined) {
    out.step = number(step, [...path, 'step'], fail);
    if (!(out.step > 0)) fail([...path, 'step'], `expected a positive step, got ${show(out.step, unit)}`);
  }
  return out;
}

/** `0.5%` -> 0.005; a bare number is a fraction (0.005). */
function parsePercent(v: unknown, path: Path, fail: Fail): number {
  let x: number;
  if (typeof v === 'string' && v.trim().endsWith('%')) x = number(v.trim().slice(0, -1), path, fail, -2); // "0.5" as 0.5e-2, no division noise
  else x = number(v, path, fail);
  if (!(x > 0 && x < 1)) fail(path, `expected a 1-sigma mismatch such as 0.5% or 0.005, got ${JSON.stringify(v)}`);
  return x;
}

function parseCorners(v: unknown, fail: Fail): string[] {
  if (v === undefined) return [];
  if (typeof v === 'string' && v.trim() !== '') return [v];
  if (Array.isArray(v) && v.length > 0 && v.every((c) => typeof c === 'string' && c.trim() !== '')) {
    if (new Set(v).size !== v.length) fail(['corner'], 'corner listed twice');
    return v as string[];
  }
  return fail(['corner'], 'expected a corner name, a list of corner names, or "all"');
}

/**
 * Resolve the spec's corner list against what the kit holds: empty -> the kit's
 * nominal corner (tt if present, else the first), "all" -> every corner, nominal first.
 */
export function resolveCorners(spec: DesignSpec, available: string[]): string[] {
  const nominal = available.includes('tt') ? 'tt' : available[0];
  let corners = spec.corners;
  if (corners.length === 0) corners = [nominal];
  if (corners.length === 1 && corners[0] === 'all') corners = [nominal, ...available.filter((c) => c !== nominal)];
  for (const c of corners) {
    if (!available.includes(c)) {
      throw new StackwrightError(`corner "${c}" is not in kit ${spec.kit} (has ${available.join(', ')})`, { where: `${spec.file}: corner` });
    }
  }
  return corners;
}
