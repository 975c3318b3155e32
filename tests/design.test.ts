import { describe, expect, it } from 'vitest';
import { parseSpec, resolveCorners } from '../src/design/index.js';

const good = `kit: demo180
corner: [tt, ss]
supply: 1.8
stacks:
  - name: tail
    device: n
    topology: cascode
    current: 40u
    rout: 50meg
    headroom: 0.45
    span: 1.6
    l: [0.18u, 2u, 10n]
    objective: area
    mismatch: 0.5%
  - name: load
    device: p
    current: 10uA
    rout: 5meg
    headroom: 300m
`;

describe('parseSpec', () => {
  it('reads engineering notation into SI and applies defaults', () => {
    const s = parseSpec(good, 'spec.yaml');
    expect(s.kit).toBe('demo180');
    expect(s.corners).toEqual(['tt', 'ss']);
    const [tail, load] = s.stacks;
    expect(tail.current).toBeCloseTo(40e-6, 18);
    expect(tail.rout).toBe(50e6);
    expect(tail.l).toEqual({ min: 0.18e-6, max: 2e-6, step: 10e-9 });
    expect(tail.mismatch).toBeCloseTo(0.005, 12);
    expect(load.topology).toBe('auto');
    expect(load.span).toBe(1.8); // default: the supply
    expect(load.objective).toBe('area');
    expect(load.headroom).toBeCloseTo(0.3, 12);
  });

  it('reads JSON too', () => {
    const s = parseSpec(JSON.stringify({ kit: 'k', supply: 1.2, stacks: [{ name: 'a', device: 'n', current: 1e-5, rout: '1meg', headroom: 0.3 }] }), 'spec.json');
    expect(s.stacks[0].rout).toBe(1e6);
  });

  const bad: Array<[string, string, RegExp]> = [
    ['missing rout', good.replace('    rout: 50meg\n', ''), /^spec\.yaml:\d+:\d+: stacks\[0\]\.rout: required key is missing$/],
    ['bad number', good.replace('rout: 5meg', 'rout: lots'), /^spec\.yaml:18:11: stacks\[1\]\.rout: .*"lots"/],
    ['bare M', good.replace('rout: 50meg', 'rout: 50M'), /stacks\[0\]\.rout: .*meg/],
    ['unknown key', good.replace('objective: area', 'objectiv: area'), /stacks\[0\]\.objectiv: unknown key/],
    ['bad device', good.replace('device: p', 'device: q'), /stacks\[1\]\.device: expected n .* or p/],
    ['bad topology', good.replace('topology: cascode', 'topology: folded'), /stacks\[0\]\.topology: expected one of single, cascode, cascode-stacked, triple, auto/],
    ['span above supply', good.replace('span: 1.6', 'span: 2.5'), /stacks\[0\]\.span: span 2.5 V exceeds the supply/],
    ['l range reversed', good.replace('[0.18u, 2u, 10n]', '[2u, 0.18u]'), /stacks\[0\]\.l\.max: max .* below min/],
    ['mismatch junk', good.replace('0.5%', '150%'), /stacks\[0\]\.mismatch/],
    ['no stacks', 'kit: a\nsupply: 1\nstacks: []\n', /stacks: expected a non-empty list/],
    ['duplicate name', good.replace('name: load', 'name: tail'), /stacks\[1\]\.name: duplicate stack name "tail"/],
    ['not yaml', 'kit: [a\n', /^spec\.yaml:\d+:\d+: not valid YAML/],
    ['negative current', good.replace('current: 40u', 'current: -40u'), /stacks\[0\]\.current: expected a positive value/],
    ['zero width limit', good.replace('    objective: area\n', '    objective: area\n    wmax: 0\n'), /stacks\[0\]\.wmax: expected a positive value/],
  ];
  it('reads the width limit wmax in metres', () => {
    expect(parseSpec(good.replace('    objective: area\n', '    objective: area\n    wmax: 500u\n'), 'spec.yaml').stacks[0].wmax).toBeCloseTo(500e-6, 15);
  });
  for (const [label, text, re] of bad) {
    it(`rejects ${label} with a one-line message naming the key path`, () => {
      let msg = '';
      try {
        parseSpec(text, 'spec.yaml');
      } catch (e) {
        msg = (e as Error).message;
      }
      expect(msg).toMatch(re);
      expect(msg).not.toContain('\n');
    });
  }
});

describe('resolveCorners', () => {
  const spec = parseSpec(good, 'spec.yaml');
  it('puts the nominal corner first for "all"', () => {
    expect(resolveCorners({ ...spec, corners: ['all'] }, ['ff', 'ss', 'tt'])).toEqual(['tt', 'ff', 'ss']);
    expect(resolveCorners({ ...spec, corners: [] }, ['ff', 'ss', 'tt'])).toEqual(['tt']);
  });
  it('names a corner the kit lacks', () => {
    expect(() => resolveCorners(spec, ['tt', 'ff'])).toThrow(/corner "ss" is not in kit demo180 \(has tt, ff\)/);
  });
});
