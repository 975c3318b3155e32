import { describe, expect, it } from 'vitest';
import { parseSpec, MAX_ALIAS_COUNT } from '../src/design/parse.js';

const stack = (extra: string) => `kit: demo180
supply: 1.8
stacks:
  - name: sink
    device: n
    current: 10u
    rout: 1meg
    headroom: 0.3
${extra}`;

/** Message of the error parseSpec throws for `text`. */
function refusal(text: string): string {
  try {
    parseSpec(text, 'spec.yaml');
  } catch (e) {
    return (e as Error).message;
  }
  throw new Error('parseSpec accepted the spec');
}

describe('spec names', () => {
  it('refuses stack names that could leave the output folder, naming the allowed characters', () => {
    for (const name of ['"../../../escaped"', '"a/b"', '".hidden"', '"a\\\\b"', '"x y"']) {
      const msg = refusal(stack('').replace('name: sink', `name: ${name}`));
      expect(msg, name).toMatch(/^spec\.yaml:4:11: stacks\[0\]\.name: stack names use letters, digits, "\.", "_" and "-"/);
    }
    expect(parseSpec(stack('').replace('name: sink', 'name: ota-tail_2.b'), 's.yaml').stacks[0].name).toBe('ota-tail_2.b');
  });

  it('refuses stage names the same way (each stage gets its own netlist file named after it)', () => {
    const stage = (name: string) => `kit: demo180\nsupply: 1.8\nstages:\n  - name: ${name}\n    current: 10u\n    gain: 300\n    swing: 0.5\n    input: {device: n}\n`;
    for (const name of ['"../../../escaped"', '"a/b"', '".hidden"', '"a\\\\b"', '"x y"']) {
      expect(refusal(stage(name)), name).toMatch(/^spec\.yaml:4:11: stages\[0\]\.name: stage names use letters, digits, "\.", "_" and "-"/);
    }
    expect(parseSpec(stage('ota-gain_2.b'), 's.yaml').stages![0].name).toBe('ota-gain_2.b');
  });

  it('refuses a kit name with a path in it', () => {
    expect(refusal(stack('').replace('kit: demo180', 'kit: ../tables/demo180'))).toMatch(/spec\.yaml:1:6: kit: kit names use letters/);
  });
});

describe('YAML aliases', () => {
  // Nested aliases multiply: 9 levels of 9 give 9^6 ≈ 531,441 nodes from a few hundred bytes
  // (the "billion laughs" pattern, common practice to refuse; the yaml library caps it with maxAliasCount).
  it('refuses exponential alias expansion with a one-line input error', () => {
    const levels = ['a', 'b', 'c', 'd', 'e', 'f'];
    const lines = ['a: &a ["x","x","x","x","x","x","x","x","x"]'];
    for (let i = 1; i < levels.length; i++) lines.push(`${levels[i]}: &${levels[i]} [${Array(9).fill('*' + levels[i - 1]).join(',')}]`);
    const text = `${lines.join('\n')}\n${stack('')}`;
    expect(refusal(text)).toBe(`spec.yaml: YAML aliases expand too far (more than ${MAX_ALIAS_COUNT} alias uses); write the values out`);
  });

  it('still reads a spec that shares a value through an alias', () => {
    const text = stack('    span: &s 1.6\n  - name: other\n    device: n\n    current: 5u\n    rout: 1meg\n    headroom: 0.3\n    span: *s\n');
    expect(parseSpec(text, 's.yaml').stacks.map((s) => s.span)).toEqual([1.6, 1.6]);
  });
});

describe('numbers in spec messages carry units', () => {
  // Raw floats such as -0.000009999999999999999 are unreadable; engineering notation is common practice.
  it('formats the value a check refused', () => {
    expect(refusal(stack('').replace('current: 10u', 'current: -10u'))).toMatch(/stacks\[0\]\.current: expected a positive value, got -10 µA$/);
    expect(refusal(stack('    l: [2u, 0.18u]\n'))).toMatch(/stacks\[0\]\.l\.max: max 180 nm is below min 2 µm$/);
    expect(refusal(stack('    gmid: [20, 5]\n'))).toMatch(/stacks\[0\]\.gmid\.max: max 5 1\/V is below min 20 1\/V$/);
    expect(refusal(stack('    span: 2.5\n'))).toMatch(/stacks\[0\]\.span: span 2\.5 V exceeds the supply 1\.8 V$/);
    expect(refusal(stack('    span: 250m\n'))).toMatch(/stacks\[0\]\.headroom: headroom 300 mV must be below span 250 mV$/);
  });
});
