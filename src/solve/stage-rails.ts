/**
 * Where a stage's input DC voltage sits against the rails. A common-source input
 * has its source on a rail, so its gate must lie within [0, supply] for the bias
 * to be reachable at all (common practice: an input common-mode range inside the
 * rails); a gate below ground or above the supply is no design.
 */

/** ≥ 0 inside [0, supply] (distance to the nearer rail as a fraction of the supply); negative outside, by how far. */
export function vinMargin(vin: number, supply: number): number {
  return Math.min(vin, supply - vin) / supply;
}

/** The rail an input DC voltage outside [0, supply] crosses: 0 below ground, else the supply. */
export function vinRail(vin: number, supply: number): number {
  return vin < 0 ? 0 : supply;
}
