/**
 * The edge of a monotone test by bisection: from `inside` (where `holds` is true) towards `outside` (where it is
 * false), `steps` halvings of the interval between them, keeping the end on each side. Returns the holding end, so
 * the answer always passes the test (common practice for a boolean edge, e.g. a width limit along gm/ID).
 *
 * @example edgeOf((x) => x * x <= 2, 1, 2, 30) // 1.4142135614529252, within 2^-30 below √2
 */
export function edgeOf(holds: (x: number) => boolean, inside: number, outside: number, steps: number): number {
  for (let it = 0; it < steps; it++) {
    const m = 0.5 * (inside + outside);
    if (holds(m)) inside = m;
    else outside = m;
  }
  return inside;
}
