import type { MismatchCoefficients } from '../../table/types.js';

/**
 * 1-sigma relative current mismatch of a device from Pelgrom's area law
 * (Pelgrom, Duinmaijer & Welbers, IEEE JSSC 1989; Kinget, IEEE JSSC 2005):
 * σ(ΔI/I)² = (gm/ID)²·A_VT²/(W·L) + A_β²/(W·L).
 */
export function pelgromSigma(gmid: number, w: number, l: number, c: MismatchCoefficients): number {
  const area = w * l;
  return Math.sqrt((gmid * gmid * c.avt * c.avt + c.abeta * c.abeta) / area);
}
