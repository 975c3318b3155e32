import { StackwrightError } from '../errors.js';
import { showText } from '../units/index.js';
import { QUANTITIES, type Quantity } from './types.js';
import { unitExamples, unitScale } from './units.js';

/** Spellings seen in sweep exports, after lower-casing and dropping spaces, '_', '-', '.'. */
const ALIASES: Record<string, Quantity> = {
  l: 'l', length: 'l', lg: 'l', lch: 'l',
  w: 'w', width: 'w', wg: 'w',
  vgs: 'vgs', vds: 'vds', vsb: 'vsb', vbs: 'vbs',
  id: 'id', ids: 'id', idrain: 'id',
  gm: 'gm', gds: 'gds', gmb: 'gmb', gmbs: 'gmb',
  cgg: 'cgg', cgs: 'cgs', cgd: 'cgd', cdd: 'cdd',
};

export interface ColumnSpec {
  index: number;
  header: string;
  quantity: Quantity;
  /** Multiply values by this to get SI. */
  scale: number;
  /** Map key that selected this column, if any. */
  mapKey?: string;
}

/** Split "L [um]" / "vgs(V)" into name and unit; "@m1[gm]" (simulator op-point names) into the parameter. */
export function splitHeader(header: string): { name: string; unit?: string } {
  const h = header.trim();
  const op = /^@[^[]*\[([^\]]+)\]$/.exec(h);
  if (op) return { name: op[1] };
  const m = /^(.*?)\s*[[(]\s*([^\])]*?)\s*[\])]$/.exec(h);
  if (m && m[1] !== '') return { name: m[1], unit: m[2] };
  return { name: h };
}

function squash(name: string): string {
  return name.toLowerCase().replace(/[\s_.-]+/g, '');
}

/** `--map HEADER=skip`: leave a column out (an extra column named like a quantity, e.g. ID/W as "Id [A/um]"). */
export const SKIP = 'skip';

export function checkMap(map: Record<string, string> | undefined): Map<string, Quantity | typeof SKIP> {
  const out = new Map<string, Quantity | typeof SKIP>();
  for (const [header, value] of Object.entries(map ?? {})) {
    const q = value.trim().toLowerCase();
    if (q !== SKIP && !(QUANTITIES as readonly string[]).includes(q)) {
      throw new StackwrightError(`unknown quantity ${showText(value)} for header ${showText(header)}; valid quantities: ${QUANTITIES.join(', ')} (or ${SKIP} to leave the column out)`, { where: '--map' });
    }
    out.set(header.trim().toLowerCase(), q as Quantity | typeof SKIP);
  }
  return out;
}

/**
 * Decide which header cell feeds which quantity, by --map or by a recognised
 * name; two columns for one quantity is an error naming both, whichever way
 * each was named.
 * `where(i)` gives the location of header cell i for messages.
 */
export function matchHeaders(headers: string[], map: Map<string, Quantity | typeof SKIP>, where: (i: number) => string, skipped: string[] = []): ColumnSpec[] {
  const chosen = new Map<Quantity, ColumnSpec>();
  headers.forEach((header, index) => {
    const { name, unit } = splitHeader(header);
    const key = header.trim().toLowerCase();
    const mapKey = map.has(key) ? key : map.has(name.trim().toLowerCase()) ? name.trim().toLowerCase() : undefined;
    let quantity: Quantity | undefined;
    let scale = 1;
    if (mapKey !== undefined) {
      const mapped = map.get(mapKey)!;
      if (mapped === SKIP) {
        skipped.push(mapKey);
        return;
      }
      quantity = mapped;
      // Mapped by full text, brackets may be part of a simulator name (i(vd)): scale only when they read as a unit.
      if (unit !== undefined) scale = mapKey === key ? unitScale(unit, quantity) ?? 1 : requireUnit(unit, quantity, header, where(index));
    } else {
      quantity = ALIASES[squash(name)];
      if (quantity === undefined) return;
      if (unit !== undefined) scale = requireUnit(unit, quantity, header, where(index), true);
    }
    const prev = chosen.get(quantity);
    if (prev) {
      // A map never silently hides a column that names the same quantity by itself.
      const how = prev.mapKey !== undefined || mapKey !== undefined ? ' (one of them through --map)' : '';
      throw new StackwrightError(`columns ${showText(prev.header)} and ${showText(header)} both give ${quantity}${how}; remove one or map it elsewhere`, { where: where(index) });
    }
    chosen.set(quantity, { index, header, quantity, scale, mapKey });
  });
  const vsb = chosen.get('vsb');
  const vbs = chosen.get('vbs');
  if (vsb && vbs) {
    throw new StackwrightError(`columns ${showText(vsb.header)} and ${showText(vbs.header)} both give the body bias; keep one`, { where: where(vbs.index) });
  }
  return [...chosen.values()].sort((a, b) => a.index - b.index);
}

function requireUnit(unit: string, q: Quantity, header: string, where: string, named = false): number {
  const s = unitScale(unit, q);
  if (s === undefined) {
    // A column named like a quantity by itself may be something else (ID/W beside ID): say how to leave it out.
    const out = named ? `, or leave the column out with --map ${showText(`${header.trim()}=${SKIP}`)}` : '';
    throw new StackwrightError(`column ${showText(header)}: unit ${showText(unit)} does not fit ${q} (use ${unitExamples(q)})${out}`, { where });
  }
  return s;
}
