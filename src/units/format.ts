/**
 * SI prefixes used for printing (not SPICE's: "M" here is mega and "P" peta, as people read it;
 * the spec parser keeps SPICE's suffixes). Exa down to atto: a Rout target of 1e15 Ω is "1 PΩ".
 */
const PREFIXES: ReadonlyArray<readonly [number, string]> = [
  [1e18, 'E'],
  [1e15, 'P'],
  [1e12, 'T'],
  [1e9, 'G'],
  [1e6, 'M'],
  [1e3, 'k'],
  [1, ''],
  [1e-3, 'm'],
  [1e-6, 'µ'],
  [1e-9, 'n'],
  [1e-12, 'p'],
  [1e-15, 'f'],
  [1e-18, 'a'],
];

/**
 * Format with an SI prefix and `digits` significant digits: formatEng(4e-5, 'A') = "40 µA".
 */
export function formatEng(x: number, unit = '', digits = 3): string {
  if (!Number.isFinite(x)) return `${x}${unit ? ' ' + unit : ''}`;
  if (x === 0) return `0${unit ? ' ' + unit : ''}`;
  const ax = Math.abs(x);
  // Beyond the prefixes (a units mistake, mostly): plain exponent form, not "2e-12 aF".
  if (ax < 1e-18 * 0.9995 || ax >= 1e21 * 0.9995) return `${Number(x.toPrecision(digits)).toExponential()}${unit ? ' ' + unit : ''}`;
  let chosen = PREFIXES[PREFIXES.length - 1];
  for (const p of PREFIXES) {
    if (ax >= p[0] * 0.9995) {
      chosen = p;
      break;
    }
  }
  const scaled = x / chosen[0];
  const text = Number(scaled.toPrecision(digits)).toString();
  const suffix = chosen[1] + unit;
  return suffix ? `${text} ${suffix}` : text;
}

/**
 * A number as a message shows it: SI prefix and unit, six significant digits so a value just
 * outside a limit does not print as the limit, never a raw float such as -0.000009999999999999999.
 * showValue(-9.999999999999999e-6, 'V') = "-10 µV".
 */
export function showValue(x: number, unit = ''): string {
  return formatEng(x, unit, 6);
}

/** A unitless number for messages: at most six significant digits. */
export function showNumber(x: number): string {
  return Number.isFinite(x) ? String(Number(x.toPrecision(6))) : String(x);
}

/**
 * Format in SPICE3 notation (meg for mega, u for micro), for netlists.
 */
export function formatSpice(x: number, digits = 6): string {
  if (x === 0) return '0';
  const table: ReadonlyArray<readonly [number, string]> = [
    [1e12, 't'], [1e9, 'g'], [1e6, 'meg'], [1e3, 'k'], [1, ''],
    [1e-3, 'm'], [1e-6, 'u'], [1e-9, 'n'], [1e-12, 'p'], [1e-15, 'f'],
  ];
  const ax = Math.abs(x);
  for (const [scale, s] of table) {
    if (ax >= scale * 0.9999995) return Number((x / scale).toPrecision(digits)).toString() + s;
  }
  return x.toExponential(digits - 1);
}
