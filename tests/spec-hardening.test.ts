import { describe, expect, it } from 'vitest';
import { parseSpec } from '../src/spec/parse.js';

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

  it('refuses a kit name with a path in it', () => {
    expect(refusal(stack('').replace('kit: demo180', 'kit: ../tables/demo180'))).toMatch(/spec\.yaml:1:6: kit: kit names use letters/);
  });
});
