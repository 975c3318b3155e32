/**
 * How a spec's sizing splits over threads: its items (stacks, then stages, in
 * spec order), an estimated cost per item, and a split of the items into
 * shares of about equal cost. Pure functions; src/solve/parallel.ts runs them.
 */
import type { DesignSpec } from '../design/types.js';

/** One independently sized part of a spec: stacks[index] or stages[index]. */
export interface SizeItem {
  kind: 'stack' | 'stage';
  index: number;
  /** Estimated cost, in single-topology searches at one corner. */
  cost: number;
}

/** Topologies an 'auto' stack (or an 'auto' stage load) tries; kept in step with the topology registry by a test. */
export const AUTO_TOPOLOGIES = 4;

/**
 * The spec's items in spec order (the order sizeDesign sizes and reports them).
 * Cost: one search per topology tried, each run at every corner (`corners`:
 * how many the spec's resolve to, as 'all' names every corner of the kit).
 */
export function sizeItems(design: DesignSpec, corners = design.corners.length): SizeItem[] {
  corners = Math.max(1, corners);
  const per = (auto: boolean) => (auto ? AUTO_TOPOLOGIES : 1) * corners;
  return [
    ...design.stacks.map((s, index): SizeItem => ({ kind: 'stack', index, cost: per(s.topology === 'auto') })),
    ...(design.stages ?? []).map((s, index): SizeItem => ({ kind: 'stage', index, cost: per(s.load.topology === 'auto') })),
  ];
}

/**
 * Split items into `shares` groups of about equal total cost: the costliest
 * first, each to the group with the least so far (ties to the lower group; group
 * 0 is the calling thread). Returns positions into `items`, each group in spec
 * order; no group is empty when shares ≤ items.length.
 */
export function splitItems(items: readonly SizeItem[], shares: number): number[][] {
  const n = Math.max(1, Math.min(shares, items.length));
  const groups: number[][] = Array.from({ length: n }, () => []);
  const load = new Float64Array(n);
  const order = items.map((_, k) => k).sort((a, b) => items[b].cost - items[a].cost || a - b);
  for (const k of order) {
    let g = 0;
    for (let j = 1; j < n; j++) if (load[j] < load[g]) g = j;
    groups[g].push(k);
    load[g] += items[k].cost;
  }
  return groups.map((g) => g.sort((a, b) => a - b));
}

/** Threads to use: the asked number (default: the available cores), never more than the items. */
export function threadsFor(items: number, cores: number, jobs?: number): number {
  return Math.max(1, Math.min(jobs ?? cores, items));
}

/** The spec cut down to one item, sized on its own exactly as within the whole spec. */
export function itemDesign(design: DesignSpec, item: Pick<SizeItem, 'kind' | 'index'>): DesignSpec {
  return {
    ...design,
    stacks: item.kind === 'stack' ? [design.stacks[item.index]] : [],
    stages: item.kind === 'stage' ? [(design.stages ?? [])[item.index]] : [],
  };
}
