import { describe, expect, it } from 'vitest';
import { formatEng, formatSpice, parseEng, showText } from '../src/units/index.js';

describe('parseEng', () => {
  // Scale factors from the Berkeley SPICE3 user's manual (section "General structure and
  // conventions"): T=1e12 G=1e9 MEG=1e6 K=1e3 MIL=25.4e-6 M=1e-3 U=1e-6 N=1e-9 P=1e-12 F=1e-15,
  // letters immediately following a number that are not scale factors are ignored.
  const spice3: Array<[string, number]> = [
    ['1T', 1e12],
    ['1G', 1e9],
    ['1MEG', 1e6],
    ['1meg', 1e6],
    ['1K', 1e3],
    ['1k', 1e3],
    ['1MIL', 25.4e-6],
    ['1m', 1e-3],
    ['1U', 1e-6],
    ['1u', 1e-6],
    ['1N', 1e-9],
    ['1P', 1e-12],
    ['1F', 1e-15],
    ['1f', 1e-15],
  ];
  for (const [text, value] of spice3) {
    it(`${text} = ${value} (SPICE3 scale table)`, () => {
      expect(parseEng(text)).toBeCloseTo(value, 30);
      expect(parseEng(text) / value).toBeCloseTo(1, 12);
    });
  }

  it('ignores trailing unit letters (SPICE3 convention): 0.18um, 10uA, 1.8V, 50megohm', () => {
    expect(parseEng('0.18um') / 0.18e-6).toBeCloseTo(1, 12);
    expect(parseEng('10uA') / 10e-6).toBeCloseTo(1, 12);
    expect(parseEng('1.8V')).toBe(1.8);
    expect(parseEng('50megohm') / 50e6).toBeCloseTo(1, 12);
    expect(parseEng('100mV') / 0.1).toBeCloseTo(1, 12);
  });

  it('accepts the micro sign and Greek mu', () => {
    expect(parseEng('40µ') / 40e-6).toBeCloseTo(1, 12);
    expect(parseEng('40μA') / 40e-6).toBeCloseTo(1, 12);
  });

  it('accepts plain and exponent numbers, signs, leading dot', () => {
    expect(parseEng('2.5e-6')).toBe(2.5e-6);
    expect(parseEng('-0.4')).toBe(-0.4);
    expect(parseEng('.5')).toBe(0.5);
    expect(parseEng('+3E3')).toBe(3000);
    expect(parseEng(' 7 ')).toBe(7);
  });

  it('rejects a bare upper-case M with a hint to write meg or e6', () => {
    expect(() => parseEng('5M')).toThrow(/meg.*e6/);
    expect(() => parseEng('5Mohm', 'stacks[0].rout')).toThrow(/^stacks\[0\]\.rout: /);
  });

  it('rejects junk with a message naming the input and where', () => {
    expect(() => parseEng('abc', 'x.csv:3:4')).toThrow(/^x\.csv:3:4: .*"abc"/);
    expect(() => parseEng('')).toThrow();
    expect(() => parseEng('1.2.3')).toThrow(/unexpected/);
    expect(() => parseEng('1e999')).toThrow(/finite/);
    expect(() => parseEng(Number.NaN)).toThrow(/finite/);
  });
});

describe('formatEng / formatSpice', () => {
  it('prints SI prefixes people read', () => {
    expect(formatEng(4e-5, 'A')).toBe('40 µA');
    expect(formatEng(5e7, 'Ω')).toBe('50 MΩ');
    expect(formatEng(0.45, 'V')).toBe('450 mV');
    expect(formatEng(1.8, 'V')).toBe('1.8 V');
    expect(formatEng(0, 'V')).toBe('0 V');
    // Outside the SI prefixes atto..exa (BIPM SI Brochure, table 7) the plain exponent form is clearer than "2e-12 aF".
    expect(formatEng(2e-30, 'F')).toBe('2e-30 F');
    expect(formatEng(-3.2e21, 'A')).toBe('-3.2e+21 A');
  });
  it('prints every SI prefix from exa down to atto (BIPM SI Brochure, 9th ed., table 7)', () => {
    // Table 7 of the SI Brochure: exa E 1e18, peta P 1e15, tera T 1e12, giga G 1e9, mega M 1e6, kilo k 1e3,
    // milli m 1e-3, micro µ 1e-6, nano n 1e-9, pico p 1e-12, femto f 1e-15, atto a 1e-18.
    const table: Array<[number, string]> = [
      [1e18, 'E'], [1e15, 'P'], [1e12, 'T'], [1e9, 'G'], [1e6, 'M'], [1e3, 'k'],
      [1e-3, 'm'], [1e-6, 'µ'], [1e-9, 'n'], [1e-12, 'p'], [1e-15, 'f'], [1e-18, 'a'],
    ];
    for (const [scale, prefix] of table) {
      expect(formatEng(scale, 'Ω')).toBe(`1 ${prefix}Ω`);
      expect(formatEng(2.5 * scale, 'Ω')).toBe(`2.5 ${prefix}Ω`);
      expect(formatEng(-470 * scale, 'A')).toBe(`-470 ${prefix}A`);
    }
    // A Rout target of 1e15 Ω was printed "1e+15 Ω" before peta was known.
    expect(formatEng(1e15, 'Ω')).toBe('1 PΩ');
    expect(formatEng(-3.2e17, 'A')).toBe('-320 PA');
    expect(formatEng(999e18, 'Ω')).toBe('999 EΩ');
  });
  it('the spec parser keeps SPICE3 suffixes: "P" is pico there, not peta, and "meg" is mega (SPICE3 user manual)', () => {
    expect(parseEng('1P')).toBe(1e-12);
    expect(parseEng('1p')).toBe(1e-12);
    expect(parseEng('1meg')).toBe(1e6);
  });
  it('prints SPICE3 suffixes that parse back to the same value (round trip through parseEng)', () => {
    for (const x of [5e7, 1.8e-7, 4e-5, 0.45, 1.8, 3.3e-15, 2e9, 12345]) {
      expect(parseEng(formatSpice(x)) / x).toBeCloseTo(1, 5);
    }
    expect(formatSpice(5e7)).toBe('50meg');
    expect(formatSpice(1.8e-7)).toBe('180n');
  });
});

describe('parseEng: blanks and one-line messages', () => {
  const oneLine = (s: string) => !/[\n\r\u2028\u2029]/.test(s);
  const messageOf = (input: string): string => {
    try {
      parseEng(input, 'spec.yaml: stacks[0].rout');
    } catch (e) {
      return (e as Error).message;
    }
    throw new Error(`${JSON.stringify(input)} was accepted`);
  };

  it('accepts one space between number and unit, as people write it', () => {
    // BIPM SI Brochure (9th ed., 5.4.3, from memory): a space separates the number from the unit; formatEng prints that way.
    expect(parseEng('10 uA') / 10e-6).toBeCloseTo(1, 12);
    expect(parseEng('1.8 V')).toBe(1.8);
    expect(parseEng(formatEng(4e-5, 'A')) / 4e-5).toBeCloseTo(1, 12);
    expect(parseEng(' 50 meg ') / 50e6).toBeCloseTo(1, 12);
  });

  it('refuses any other blank inside the text instead of reading the number before it', () => {
    // Project rule (src/units/parse.ts): "1\nx" must not quietly read as 1.
    expect(parseEng('1\n')).toBe(1); // blanks around the text are trimmed, as before
    for (const s of ['1\nx', '10  uA', '10\tuA', '10 \nuA', '1 2', '1\r\nV', '1 u A']) {
      const msg = messageOf(s);
      expect(msg.startsWith('spec.yaml: stacks[0].rout: '), msg).toBe(true);
      expect(oneLine(msg), msg).toBe(true);
    }
    expect(messageOf('1\nx')).toBe('spec.yaml: stacks[0].rout: "1\\nx" has unexpected characters "\\nx" after the number');
  });

  it('shows long or control-laden input escaped and cut to 40 characters', () => {
    // Project rule (DEVELOPERS.md): messages are one line.
    const msg = messageOf('x'.repeat(5000));
    expect(msg).toBe(`spec.yaml: stacks[0].rout: expected a number with optional scale suffix (e.g. 40u, 50meg), got "${'x'.repeat(40)}"…`);
    expect(showText('a\u2028b\u0085c\u007f\u0000"')).toBe('"a\\u2028b\\u0085c\\u007f\\u0000\\""');
    expect(showText('short')).toBe('"short"');
    // Cut by code points, so an astral character is never split (ECMA-262 string iterator).
    expect(showText('😀'.repeat(3), 2)).toBe('"😀😀"…');
  });
});
