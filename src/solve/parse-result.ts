import { StackwrightError } from '../errors.js';
import type { SizeResult, StackResult } from './types.js';
import type { StageResult } from './stage-types.js';
import { NAME, NAME_RULE } from '../design/parse.js';

/**
 * A saved `size --json` result read back as a SizeResult, checked far enough for
 * a netlist: "supply", and for each stack (and each stage side) devices with numeric w, l and gate.
 * `where` names the source in errors (a file path). JSON has no Infinity, so the
 * null that `size --json` writes for a headroom never reached becomes Infinity again.
 * Throws StackwrightError (kind 'input') on text that is not such a result.
 */
export function parseSizeResult(text: string, where: string): SizeResult {
  let data: unknown;
  try {
    data = JSON.parse(text);
  } catch (e) {
    throw new StackwrightError(`not valid JSON: ${(e as Error).message}`, { where });
  }
  const r = data as Partial<SizeResult>;
  if (!r || typeof r !== 'object' || !Array.isArray(r.stacks) || typeof r.supply !== 'number') {
    throw new StackwrightError('expected the JSON printed by `stackwright size --json` (with "supply" and "stacks")', { where });
  }
  if (r.stages !== undefined && !Array.isArray(r.stages)) throw new StackwrightError('expected a list', { where: `${where}: stages` });
  (r.stages ?? []).forEach((s, i) => {
    for (const side of ['input', 'load'] as const) {
      const devices = s?.[side]?.devices;
      if (!Array.isArray(devices)) throw new StackwrightError('expected a list of devices', { where: `${where}: stages[${i}].${side}.devices` });
      devices.forEach((d, k) => {
        for (const key of ['w', 'l', 'gate'] as const) {
          if (typeof d?.[key] !== 'number') throw new StackwrightError('expected a number', { where: `${where}: stages[${i}].${side}.devices[${k}].${key}` });
        }
      });
    }
    checkStageForDeck(s, `${where}: stages[${i}]`);
  });
  r.stacks.forEach((s, i) => {
    if (!s || !Array.isArray(s.devices) || s.devices.length === 0) throw new StackwrightError('stack has no devices', { where: `${where}: stacks[${i}].devices` });
    s.devices.forEach((d, k) => {
      for (const key of ['w', 'l', 'gate'] as const) {
        if (typeof d?.[key] !== 'number') throw new StackwrightError(`expected a number`, { where: `${where}: stacks[${i}].devices[${k}].${key}` });
      }
    });
    checkStackForDeck(s, `${where}: stacks[${i}]`);
  });
  for (const s of r.stacks) if (s.predicted && s.predicted.headroom === null) s.predicted.headroom = Infinity;
  return r as SizeResult;
}

const ROLES = ['bottom', 'middle', 'top'];

/** A positive number (SPICE3: a MOSFET's W and L, a bias current), else a one-line error at `where`. */
function positive(x: unknown, where: string): void {
  if (typeof x !== 'number' || !(x > 0)) throw new StackwrightError(`expected a positive number, got ${JSON.stringify(x) ?? 'nothing'}`, { where });
}

function checkName(kind: 'stack' | 'stage', name: unknown, at: string): void {
  if (typeof name !== 'string' || !NAME.test(name)) throw new StackwrightError(`${kind} names use ${NAME_RULE}; got ${JSON.stringify(name) ?? 'nothing'}`, { where: `${at}.name` });
}

function checkRole(role: unknown, where: string): void {
  if (!ROLES.includes(role as string)) throw new StackwrightError(`expected one of ${ROLES.join(', ')}, got ${JSON.stringify(role) ?? 'nothing'}`, { where });
}

/** A series of devices as a deck writes it (a stack, or one side of a stage): type, roles, positive sizes, bias devices. */
function checkSeries(x: Pick<StackResult, 'device' | 'devices' | 'bias'>, at: string): void {
  if (x.device !== 'n' && x.device !== 'p') throw new StackwrightError(`expected "n" or "p", got ${JSON.stringify(x.device) ?? 'nothing'}`, { where: `${at}.device` });
  x.devices.forEach((d, k) => {
    checkRole(d.role, `${at}.devices[${k}].role`);
    positive(d.w, `${at}.devices[${k}].w`);
    positive(d.l, `${at}.devices[${k}].l`);
  });
  checkBias(x.bias, `${at}.bias`);
}

/**
 * What a netlist writes from a stack, checked so a hand-edited result fails here with the
 * field named rather than as `W=NaN`, a negative width, a line break inside a comment or a crash:
 * name, type, roles, positive widths and lengths, the bias devices and the predicted figures.
 */
function checkStackForDeck(s: StackResult, at: string): void {
  checkName('stack', s.name, at);
  checkSeries(s, at);
  const p = s.predicted;
  if (!p || typeof p !== 'object' || typeof p.iout !== 'number' || typeof p.rout !== 'number' || !(typeof p.headroom === 'number' || p.headroom === null)) {
    throw new StackwrightError('expected the predicted iout, rout and headroom (numbers; headroom may be null)', { where: `${at}.predicted` });
  }
  // `size --spice` adds the sizes simulation confirmed; a netlist writes those.
  const k = (s as { corrected?: { devices?: unknown; bias?: unknown } }).corrected;
  if (k === undefined) return;
  const kd = k?.devices as Array<{ w: unknown; gate: unknown }> | undefined;
  if (!Array.isArray(kd) || kd.length !== s.devices.length) throw new StackwrightError(`expected ${s.devices.length} corrected devices`, { where: `${at}.corrected.devices` });
  kd.forEach((d, i) => {
    positive(d?.w, `${at}.corrected.devices[${i}].w`);
    if (typeof d?.gate !== 'number') throw new StackwrightError('expected a number', { where: `${at}.corrected.devices[${i}].gate` });
  });
  checkBias(k.bias, `${at}.corrected.bias`);
}

/** What a stage deck writes from a stage: name, each side's type, roles, positive sizes and bias diodes, the predicted figures it quotes. */
function checkStageForDeck(s: StageResult, at: string): void {
  checkName('stage', s.name, at);
  for (const side of ['input', 'load'] as const) checkSeries(s[side], `${at}.${side}`);
  const p = s.predicted;
  if (!p || typeof p !== 'object' || !(['gain', 'swing', 'output', 'vin'] as const).every((k) => typeof p[k] === 'number')) {
    throw new StackwrightError('expected the predicted gain, swing, output and vin (numbers)', { where: `${at}.predicted` });
  }
}

/** A stack's bias devices (or the corrected ones) as a netlist writes them. */
function checkBias(bias: unknown, at: string): void {
  if (!Array.isArray(bias)) throw new StackwrightError('expected a list of bias devices', { where: at });
  (bias as StackResult['bias']).forEach((b, j) => {
    const bw = `${at}[${j}]`;
    if (!b || typeof b !== 'object') throw new StackwrightError('expected a bias device', { where: bw });
    checkRole(b.drives, `${bw}.drives`);
    for (const key of ['w', 'l', 'current'] as const) positive(b[key], `${bw}.${key}`);
    if (typeof b.voltage !== 'number') throw new StackwrightError('expected a number', { where: `${bw}.voltage` });
  });
}
