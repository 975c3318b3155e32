/**
 * The library's front door: the few calls a script needs, the same ones the CLI uses.
 *
 * @example
 *   import { loadKit, sizeSpec, parseSpec } from 'stackwright';
 *   const spec = parseSpec(text, 'spec.yaml');
 *   const { result } = sizeSpec(spec, loadKit(spec.kit));
 */
import { StackwrightError } from './errors.js';
import { listKits, listTables, loadTable, readTableHeader, tablePath } from './table/store.js';
import type { DeviceTable, Polarity } from './table/types.js';
import { kitAccessFromSources } from './solve/kit-tables.js';
import type { KitAccess } from './solve/kit.js';
import { sizeDesign, sizeStack as sizeOneStack } from './solve/size.js';
import { chooseResult, decidingResults } from './solve/choose.js';

export { decidingResults };
import type { FrontPoint } from './solve/pareto.js';
import type { CornerResult, SizeResult, StackResult } from './solve/types.js';
import { compareResults, harderTargets, type Change } from './solve/compare.js';
import { evaluateAtCorner } from './solve/corners.js';
import type { DesignSpec, StackSpec } from './spec/types.js';
import { tablesDirFor } from './locate.js';

/** A kit's tables, loaded, with what the search needs. */
export interface Kit extends KitAccess {
  /** Folder the tables came from. */
  dir: string;
  table(device: Polarity, corner: string): DeviceTable;
}

/**
 * A kit's tables by name; each table is read when first needed (sizing at tt
 * reads only the tt tables it uses). Without `tables`, looks in ./tables and
 * then in the package's bundled demo tables.
 */
export function loadKit(kit: string, opts: { tables?: string } = {}): Kit {
  const dir = tablesDirFor(kit, opts.tables);
  const names = listTables(dir, kit);
  if (names.length === 0) {
    const have = listKits(dir);
    throw new StackwrightError(`kit ${kit} not found in ${dir}` + (have.length ? ` (has ${have.join(', ')})` : ' (no kits there)'));
  }
  const sources = names.map((name) => {
    const device = name.slice(0, 1) as Polarity;
    const corner = name.slice(2);
    return { device, corner, load: () => loadTable(dir, kit, device, corner), meta: () => readTableHeader(tablePath(dir, kit, device, corner)).meta };
  });
  const access = kitAccessFromSources(kit, sources);
  return {
    ...access,
    dir,
    table: (device, corner) => loadTable(dir, kit, device, corner),
  };
}

/** Size one stack on a kit; returns one result per topology tried and the Pareto front. */
export function sizeStack(spec: StackSpec, kit: KitAccess, opts: { supply: number; corners: string[] }) {
  return sizeOneStack(spec, kit, opts);
}

export interface SizeRun {
  result: SizeResult;
  /** Pareto front per stack name. */
  fronts: Record<string, FrontPoint[]>;
}

/**
 * Size every stack of a spec. With topology 'auto' each topology gets a result
 * and the one the objective prefers is marked `chosen`.
 */
export function sizeSpec(spec: DesignSpec, kit: KitAccess): SizeRun {
  const { fronts, ...result } = sizeDesign(spec, kit);
  for (const s of spec.stacks) {
    if (s.topology !== 'auto') continue;
    const mine = result.stacks.filter((r) => r.name === s.name);
    const pick = chooseResult(mine, s);
    for (const r of mine) r.chosen = r === pick;
  }
  return { result, fronts };
}


export interface PortStack {
  name: string;
  from: StackResult;
  to: StackResult;
  changes: Change[];
  harder: string[];
  /** The old sizes as they are, re-evaluated on the new kit's tables (gates from the old bias devices). */
  asIs: CornerResult | { error: string };
}

export interface PortRun {
  from: SizeRun;
  to: SizeRun;
  /** Spec as re-targeted to the new kit (supply, spans). */
  toSpec: DesignSpec;
  notes: string[];
  stacks: PortStack[];
}

/**
 * Re-size a spec on a new kit and compare. The new kit's supply is `supply`, else
 * the old one capped at the top of the new tables' vds axis; a span above the
 * new supply keeps its distance from the far rail (reported in `notes`).
 */
export function portSpec(spec: DesignSpec, from: Kit, to: Kit, opts: { supply?: number } = {}): PortRun {
  const notes: string[] = [];
  const vdsTop = Math.min(...(['n', 'p'] as Polarity[]).flatMap((d) => to.corners.flatMap((c) => {
    try {
      const ax = to.table(d, c).axes.vds;
      return [ax[ax.length - 1]];
    } catch {
      return [];
    }
  })));
  const supply = opts.supply ?? Math.min(spec.supply, vdsTop);
  if (supply !== spec.supply) notes.push(`supply ${spec.supply} V -> ${supply} V on kit ${to.kit}`);
  const stacks = spec.stacks.map((s) => {
    if (s.span <= supply) return s;
    let span = s.span - (spec.supply - supply);
    if (!(span > s.headroom + 0.05)) span = (s.span * supply) / spec.supply;
    notes.push(`${s.name}: span ${s.span} V -> ${Number(span.toFixed(3))} V`);
    return { ...s, span };
  });
  const fromSpec: DesignSpec = { ...spec, kit: from.kit };
  const toSpec: DesignSpec = { ...spec, kit: to.kit, supply, stacks };
  const runFrom = sizeSpec(fromSpec, from);
  const runTo = sizeSpec(toSpec, to);
  const chosen = (run: SizeRun, name: string): StackResult => decidingResults(run.result).find((r) => r.name === name) as StackResult;
  const compared = toSpec.stacks.map((s, i) => {
    const a = chosen(runFrom, s.name);
    const b = chosen(runTo, s.name);
    let asIs: PortStack['asIs'];
    try {
      asIs = evaluateAtCorner(a, s, to, runTo.result.corners[0], supply);
    } catch (e) {
      asIs = { error: (e as Error).message };
    }
    return { name: s.name, from: a, to: b, changes: compareResults(a, b), harder: harderTargets(spec.stacks[i], a, b), asIs };
  });
  return { from: runFrom, to: runTo, toSpec, notes, stacks: compared };
}
