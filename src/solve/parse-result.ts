import { StackwrightError } from '../errors.js';
import type { SizeResult } from './types.js';

/**
 * A saved `size --json` result read back as a SizeResult, checked far enough for
 * a netlist: "supply", and for each stack devices with numeric w, l and gate.
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
  r.stacks.forEach((s, i) => {
    if (!s || !Array.isArray(s.devices) || s.devices.length === 0) throw new StackwrightError('stack has no devices', { where: `${where}: stacks[${i}].devices` });
    s.devices.forEach((d, k) => {
      for (const key of ['w', 'l', 'gate'] as const) {
        if (typeof d?.[key] !== 'number') throw new StackwrightError(`expected a number`, { where: `${where}: stacks[${i}].devices[${k}].${key}` });
      }
    });
  });
  for (const s of r.stacks) if (s.predicted && s.predicted.headroom === null) s.predicted.headroom = Infinity;
  return r as SizeResult;
}
