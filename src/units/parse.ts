import { StackwrightError } from '../errors.js';
import { showText } from './show.js';

/**
 * Scale suffixes of Berkeley SPICE3 (user's manual, "Number formats"):
 * T=1e12 G=1e9 MEG=1e6 K=1e3 MIL=25.4e-6 M=1e-3 U=1e-6 N=1e-9 P=1e-12 F=1e-15,
 * matched case-insensitively; letters after a suffix are ignored ("0.18um").
 * We add the micro sign, and reject a bare upper-case "M" because outside
 * SPICE it usually means mega.
 */
const SCALE: ReadonlyArray<readonly [string, number]> = [
  ['meg', 6],
  ['mil', NaN], // 25.4e-6: not a power of ten, multiplied
  ['t', 12],
  ['g', 9],
  ['k', 3],
  ['m', -3],
  ['u', -6],
  ['µ', -6],
  ['μ', -6],
  ['n', -9],
  ['p', -12],
  ['f', -15],
];
const MIL = 25.4e-6;

/**
 * The decimal `text` (as NUMBER matched it) times 10^`shift`, read as one decimal
 * literal ("10" and -6 -> Number("10e-6")), so the result is the double nearest the
 * exact value (IEEE 754 round-to-nearest), not the product of two rounded doubles.
 */
function shifted(text: string, shift: number): number {
  if (shift === 0) return Number(text);
  const e = text.search(/[eE]/);
  const mantissa = e < 0 ? text : text.slice(0, e);
  const exp = e < 0 ? 0 : Number(text.slice(e + 1));
  return Number(`${mantissa}e${exp + shift}`);
}

const NUMBER = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?/;

/**
 * Parse an engineering-notation number: `40u`, `50meg`, `0.18um`, `1.8`,
 * `2.5e-6`, `10µA`, `10 uA`. Throws a StackwrightError naming `where` on bad input.
 * After trimming, the only blank allowed is one space between number and unit,
 * as formatEng prints it; anything else (a line break, a tab, two spaces) is refused
 * rather than read as the number before it.
 *
 * @example parseEng('0.18um') // 1.8e-7
 * @example parseEng('50meg')  // 5e7
 */
export function parseEng(input: string | number, where?: string): number {
  return parseEngShifted(input, 0, where);
}

/**
 * parseEng of `input` times 10^`shift`, exact in the decimal digits as parseEng is
 * (a percentage is parseEngShifted(text, -2): "0.5" -> Number("0.5e-2")).
 */
export function parseEngShifted(input: string | number, shift: number, where?: string): number {
  if (typeof input === 'number') {
    if (!Number.isFinite(input)) throw new StackwrightError(`expected a finite number, got ${input}`, { where });
    return shift === 0 ? input : parseEngShifted(String(input), shift, where);
  }
  const text = input.trim();
  const m = NUMBER.exec(text);
  if (!m) throw new StackwrightError(`expected a number with optional scale suffix (e.g. 40u, 50meg), got ${showText(input)}`, { where });
  const base = shifted(m[0], shift);
  const rest = text.slice(m[0].length).replace(/^ (?=\S)/, '');
  if (rest === '') return finite(base, input, where);
  if (rest.startsWith('M') && !/^(meg|mil)/i.test(rest)) {
    throw new StackwrightError(
      `${showText(input)}: a bare upper-case M is ambiguous (SPICE reads milli); write ${showText(`${m[0]}meg`)} or ${showText(`${m[0]}e6`)} for mega, ${showText(`${m[0]}m`)} for milli`,
      { where },
    );
  }
  const lower = rest.toLowerCase();
  for (const [suffix, scale] of SCALE) {
    if (lower.startsWith(suffix)) {
      const tail = rest.slice(suffix.length);
      checkUnitTail(tail, input, where);
      return finite(Number.isNaN(scale) ? base * MIL : shifted(m[0], shift + scale), input, where);
    }
  }
  checkUnitTail(rest, input, where);
  return finite(base, input, where);
}

// After the number and scale only unit letters may follow (V, A, m, ohm, %, ...).
function checkUnitTail(tail: string, input: string, where?: string): void {
  if (!/^[A-Za-zΩ%°/·.\u00b5]*$/.test(tail)) {
    throw new StackwrightError(`${showText(input)} has unexpected characters ${showText(tail)} after the number`, { where });
  }
}

function finite(x: number, input: string, where?: string): number {
  if (!Number.isFinite(x)) throw new StackwrightError(`${showText(input)} is not a finite number`, { where });
  return x;
}

/**
 * A derived spec value as the decimal it stands for: `x` to 12 significant digits
 * (0.6·1.2/1.8 = 0.39999999999999997 -> 0.4), so values scaled from a spec carry
 * no float noise into verdicts and JSON.
 */
export function specDecimal(x: number): number {
  return Number.isFinite(x) ? Number(x.toPrecision(12)) : x;
}

/** Parse a value that may be a number (JSON/YAML) or an engineering string. */
export function parseEngValue(value: unknown, where?: string): number {
  if (typeof value === 'number' || typeof value === 'string') return parseEng(value, where);
  throw new StackwrightError(`expected a number, got ${value === null ? 'null' : typeof value}`, { where });
}
