import { spawnSync } from 'node:child_process';
import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';

const { v8FlagsFor } = createRequire(import.meta.url)('../scripts/v8-flags.cjs') as { v8FlagsFor: (major: number) => string };

/** The flags of `flags` that the V8 of the node binary `node` does not list in `--v8-options`. */
function flagsUnknownTo(node: string, flags: string): string[] {
  const listing = spawnSync(node, ['--v8-options'], { encoding: 'utf8' }).stdout;
  const known = new Set([...listing.matchAll(/^\s+--([a-z0-9-]+)/gm)].map((m) => m[1]));
  expect(known.size).toBeGreaterThan(100);
  return flags.split(' ').filter((f) => f && !known.has(f.replace(/^--(no-)?/, '').replace(/=.*$/, '')));
}

// V8 prints "Error: unrecognized flag" on every start for a flag its version lacks (node 22 and 24 printed it for
// --interrupt-budget), so each flag the launcher sets must be one the running node's V8 lists.
describe('the launcher V8 flags', () => {
  it('are all known to this node (node --v8-options)', () => {
    expect(flagsUnknownTo(process.execPath, v8FlagsFor(Number(process.versions.node.split('.')[0])))).toEqual([]);
  });

  it('set nothing this node does not understand when started (no stderr from the launcher)', () => {
    const major = Number(process.versions.node.split('.')[0]);
    const flags = v8FlagsFor(major);
    const r = spawnSync(process.execPath, ['-e', `require('node:v8').setFlagsFromString(${JSON.stringify(flags)})`], { encoding: 'utf8' });
    expect(r.status).toBe(0);
    expect(r.stderr).toBe('');
  });

  // Other node builds, when given (STACKWRIGHT_TEST_NODES=/path/to/node:/path/to/other-node): the same check for each
  // (run with node 18.20, 21.7, 22.23 and 24.22 when the table was made).
  const others = (process.env.STACKWRIGHT_TEST_NODES ?? '').split(':').filter(Boolean);
  it.skipIf(others.length === 0)('are all known to the other node builds given', () => {
    for (const node of others) {
      const major = Number(spawnSync(node, ['-p', 'process.versions.node'], { encoding: 'utf8' }).stdout.split('.')[0]);
      expect(flagsUnknownTo(node, v8FlagsFor(major)), node).toEqual([]);
    }
  });
});
