import { StackwrightError } from '../errors.js';
import type { IngestOptions } from './types.js';

/**
 * Plausible ranges for what is stored beside the table. Temperature: the
 * military range −55..125 °C and automotive grade 0 (−40..150 °C) fit with
 * margin (common practice); below absolute zero or at 900 °C is a typo that
 * would change sizing. Pelgrom coefficients: A_VT is about 1–10 mV·µm in bulk
 * CMOS and A_β about 0.5–3 %·µm (Pelgrom et al., IEEE JSSC 1989; Kinget, IEEE JSSC
 * 2005); the accepted ranges are wider, but negative or zero A_VT is refused.
 */
export const TEMPERATURE_RANGE = { min: -60, max: 200 } as const;
/** A_VT in mV·µm as the CLI takes it (stored in V·m: × 1e-9). */
export const AVT_RANGE = { min: 0.1, max: 50 } as const;
/** A_β in %·µm as the CLI takes it (stored as fraction·m: × 1e-8). */
export const ABETA_RANGE = { min: 0, max: 20 } as const;

const num = (x: number) => Number(x.toPrecision(6)).toString();

/** Refuse an implausible temperature or Pelgrom coefficient, naming the flag and the accepted range. */
export function checkConditions(opts: Pick<IngestOptions, 'temperature' | 'mismatch'>): void {
  const t = opts.temperature;
  if (t !== undefined && !(t >= TEMPERATURE_RANGE.min && t <= TEMPERATURE_RANGE.max)) {
    throw new StackwrightError(
      `temperature ${num(t)} °C is implausible for a corner; expected ${TEMPERATURE_RANGE.min} °C to ${TEMPERATURE_RANGE.max} °C`,
      { where: '--temperature' },
    );
  }
  const m = opts.mismatch;
  if (!m) return;
  const avt = m.avt * 1e9;
  if (!(avt >= AVT_RANGE.min && avt <= AVT_RANGE.max)) {
    throw new StackwrightError(`A_VT ${num(avt)} mV·µm is implausible; expected ${AVT_RANGE.min} to ${AVT_RANGE.max} mV·µm (typically 1–10)`, { where: '--avt' });
  }
  const abeta = m.abeta * 1e8;
  if (!(abeta >= ABETA_RANGE.min && abeta <= ABETA_RANGE.max)) {
    throw new StackwrightError(`A_β ${num(abeta)} %·µm is implausible; expected ${ABETA_RANGE.min} to ${ABETA_RANGE.max} %·µm (typically 0.5–3)`, { where: '--abeta' });
  }
}
