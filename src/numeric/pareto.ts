/**
 * Pareto dominance over criteria that are all minimised.
 *
 * @param a, b  criteria vectors of equal length
 * @returns     true when a is no worse than b everywhere and strictly better somewhere
 */
export function dominates(a: readonly number[], b: readonly number[]): boolean {
  let strictly = false;
  for (let k = 0; k < a.length; k++) {
    if (a[k] > b[k]) return false;
    if (a[k] < b[k]) strictly = true;
  }
  return strictly;
}

/**
 * Items no other item dominates (the non-dominated set), in input order; equal
 * criteria vectors do not dominate each other, so ties are all kept. O(n²).
 *
 * @param items  anything
 * @param crit   criteria of an item, all to be minimised (NaN compares false: never dominates, never dominated)
 */
export function nonDominated<T>(items: readonly T[], crit: (t: T) => readonly number[]): T[] {
  const c = items.map(crit);
  return items.filter((_, a) => !c.some((cb, b) => b !== a && dominates(cb, c[a])));
}
