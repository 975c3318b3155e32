import { readFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { REPO } from './helpers/cli.js';

/**
 * Modules a command loads before it runs: every static `import ... from` reachable
 * from its file (dynamic `import()` is not followed: it runs only when asked for).
 */
function staticImports(entry: string): { files: Set<string>; packages: Set<string> } {
  const files = new Set<string>();
  const packages = new Set<string>();
  const visit = (file: string): void => {
    if (files.has(file)) return;
    files.add(file);
    const text = readFileSync(file, 'utf8');
    // `import type` is erased by the compiler, so it loads nothing.
    for (const m of text.matchAll(/^(?:import|export)\s+(?!type\s)(?:[^'"]*?\sfrom\s+)?['"]([^'"]+)['"]/gm)) {
      const spec = m[1];
      if (spec.startsWith('.')) visit(resolve(dirname(file), spec.replace(/\.js$/, '.ts')));
      else if (!spec.startsWith('node:')) packages.add(spec.split('/')[0]);
    }
  };
  visit(join(REPO, entry));
  return { files, packages };
}

describe('start-up: what size and probe load', () => {
  // The CSV importer (papaparse, ml-regression) and the chart code (d3) are not needed to size or probe.
  for (const command of ['size', 'probe']) {
    it(`${command} loads no ingest, chart or simulator code up front`, () => {
      const main = staticImports('src/cli/main.ts');
      const cmd = staticImports(`src/cli/commands/${command}.ts`);
      const packages = new Set([...main.packages, ...cmd.packages]);
      for (const p of ['papaparse', 'ml-regression', 'd3-scale', 'd3-shape', 'd3-interpolate']) expect(packages.has(p), p).toBe(false);
      const files = [...main.files, ...cmd.files].map((f) => f.slice(REPO.length + 1));
      expect(files.filter((f) => f.startsWith('src/ingest/') || f.startsWith('src/spice/characterise') || f === 'src/report/chart.ts')).toEqual([]);
    });
  }
});
