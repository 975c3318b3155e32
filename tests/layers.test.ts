import { readFileSync, readdirSync, statSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

// The direction of imports the project's map (DEVELOPERS.md) sets: a module may import its own layer or lower ones,
// never a higher one. Same-rank folders (ingest/device, report/spice) may use each other.
const RANK: Record<string, number> = {
  'errors.ts': 0, 'units': 0, 'policy.ts': 0, 'fsutil.ts': 0,
  numeric: 1,
  table: 2,
  ingest: 3, device: 3,
  stack: 4,
  topology: 5,
  design: 6,
  solve: 7,
  report: 8, spice: 8, confirm: 8, synth: 8,
  cli: 9, 'api.ts': 9, 'index.ts': 9,
};

const SRC = resolve(dirname(fileURLToPath(import.meta.url)), '..', 'src');

function filesUnder(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name);
    return statSync(p).isDirectory() ? filesUnder(p) : p.endsWith('.ts') ? [p] : [];
  });
}

/** Top-level unit of a path under src/: its folder, or the file name for files directly in src/. */
function unitOf(path: string): string {
  return relative(SRC, path).split(/[\\/]/)[0].replace(/\.js$/, '.ts');
}

/** Relative import specifiers of a source text: static imports/exports and dynamic import(). */
export function importsOf(text: string): string[] {
  const out: string[] = [];
  for (const m of text.matchAll(/(?:^|\s)(?:import|export)\s[^'";]*?from\s*['"](\.[^'"]+)['"]|import\(\s*['"](\.[^'"]+)['"]\s*\)/gm)) out.push(m[1] ?? m[2]);
  return out;
}

/** Upward edges (from → to) among the given ones, by RANK; an unknown unit is reported too. */
export function upward(edges: Array<[string, string]>): string[] {
  const bad: string[] = [];
  for (const [from, to] of edges) {
    const a = RANK[from];
    const b = RANK[to];
    if (a === undefined || b === undefined) bad.push(`${from} -> ${to} (unit without a layer)`);
    else if (b > a) bad.push(`${from} -> ${to}`);
  }
  return bad;
}

describe('import direction between layers', () => {
  const edges: Array<[string, string, string]> = [];
  for (const file of filesUnder(SRC)) {
    for (const spec of importsOf(readFileSync(file, 'utf8'))) {
      edges.push([unitOf(file), unitOf(resolve(dirname(file), spec)), `${relative(SRC, file)} imports ${spec}`]);
    }
  }

  it('finds the imports it checks (the walk is not empty)', () => {
    // Known edges of the tree: the solver uses the stack layer, the CLI uses the report.
    expect(edges.some(([a, b]) => a === 'solve' && b === 'stack')).toBe(true);
    expect(edges.some(([a, b]) => a === 'cli' && b === 'report')).toBe(true);
    expect(importsOf("import { x } from '../solve/index.js';\nexport * from './y.js';\nconst m = await import('../cli/z.js');")).toEqual(['../solve/index.js', './y.js', '../cli/z.js']);
  });

  it('flags an upward import (the check itself can fail)', () => {
    expect(upward([['stack', 'solve'], ['table', 'numeric'], ['report', 'spice']])).toEqual(['stack -> solve']);
    expect(upward([['somewhere', 'stack']])).toHaveLength(1);
  });

  it('no module in src/ imports a higher layer: units → numeric → table → ingest/device → stack → topology → design → solve → report/spice → cli', () => {
    const bad = edges.filter(([a, b]) => upward([[a, b]]).length > 0).map(([, , what]) => what);
    expect(bad).toEqual([]);
  });
});
