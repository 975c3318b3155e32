import { copyFileSync, mkdirSync, mkdtempSync, readFileSync, rmSync, truncateSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadKit, sizeSpec } from '../src/api.js';
import { parseSpec } from '../src/design/index.js';
import { clearTableCache, kitInventory, tablePath } from '../src/table/index.js';
import { cli, ensureDemoTables, REPO } from './helpers/cli.js';

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
    // A require() at module level (createRequire) loads at import time too; one inside a function does not.
    for (const m of text.matchAll(/^\S.*\(['"]([a-z@][^'"]*)['"]\)/gm)) if (/require/i.test(m[0])) packages.add(m[1].split('/')[0]);
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
      // The simulator runner (child processes, fs/promises) loads only with --spice.
      expect(files.filter((f) => f === 'src/spice/run.ts' || f.startsWith('src/confirm/'))).toEqual([]);
    });
  }
});

describe('loadKit reads only the tables sizing needs', () => {
  let dir: string;
  beforeAll(() => {
    ensureDemoTables();
    dir = mkdtempSync(join(tmpdir(), 'sw-lazy-'));
    mkdirSync(join(dir, 'demo180'));
    for (const name of ['n-tt', 'p-tt', 'n-ss', 'p-ss']) copyFileSync(join(REPO, 'tables', 'demo180', `${name}.swtab`), join(dir, 'demo180', `${name}.swtab`));
    // An unrelated corner's table, cut short as an interrupted copy would leave it.
    truncateSync(tablePath(dir, 'demo180', 'n', 'ss'), 1000);
    clearTableCache();
  });
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  const spec = (corner: string) => parseSpec(`kit: demo180\ncorner: ${corner}\nsupply: 1.8\nstacks:\n  - name: sink\n    device: n\n    topology: cascode\n    current: 20u\n    rout: 20meg\n    headroom: 0.5\n    span: 1.6\n`, 'lazy.yaml');

  it('sizes at tt although the ss table is broken, and lists both corners', () => {
    const kit = loadKit('demo180', { tables: dir });
    expect([...kit.corners].sort()).toEqual(['ss', 'tt']);
    const run = sizeSpec(spec('tt'), kit);
    expect(run.result.stacks.some((s) => s.feasible)).toBe(true);
  });

  it('names the broken file when sizing does need it', () => {
    const kit = loadKit('demo180', { tables: dir });
    expect(() => sizeSpec(spec('ss'), kit)).toThrow(/n-ss\.swtab: table header line is not terminated/);
  });

  it('kits lists the broken table as broken and the others as usual', () => {
    const inv = kitInventory(dir);
    expect(inv[0].tables.map((t) => `${t.device}-${t.corner}`)).toEqual(['n-tt', 'p-ss', 'p-tt']);
    expect(inv[0].broken.map((b) => b.name)).toEqual(['n-ss']);
    const r = cli(['kits', '--tables', dir]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/broken table n-ss: .*n-ss\.swtab: table header line is not terminated/);
    expect(r.stdout).toMatch(/^p-tt /m);
    const j = JSON.parse(cli(['kits', '--tables', dir, '--json']).stdout);
    expect(j.kits[0].broken[0].name).toBe('n-ss');
  });
});

describe('probe reads the two table lengths around --l', () => {
  beforeAll(() => ensureDemoTables());
  // Same numbers as the whole table (whose slices are checked against SciPy in tests/device.test.ts).
  it('gives the same operating point as the whole table, from a quarter of the file', async () => {
    const { probe } = await import('../src/device/index.js');
    const { readTableAround } = await import('../src/table/partial.js');
    const { loadTable } = await import('../src/table/store.js');
    const dir = join(REPO, 'tables');
    for (const device of ['n', 'p'] as const) {
      const whole = loadTable(dir, 'demo180', device, 'tt');
      for (const l of [0.19e-6, 0.5e-6, 1e-6, 1.9e-6]) {
        const part = readTableAround(tablePath(dir, 'demo180', device, 'tt'), l);
        expect(part?.axes.l.length).toBe(2);
        for (const q of [{ gmid: 12, vds: 0.6 }, { vgs: 0.7, vds: 0.3, vsb: 0.2 }, { jd: 5 }]) {
          expect(probe(part!, { l, ...q })).toEqual(probe(whole, { l, ...q }));
        }
      }
      // At or beyond the ends the whole table is read, so range messages stay as they are.
      expect(readTableAround(tablePath(dir, 'demo180', device, 'tt'), 0.18e-6)).toBeUndefined();
      expect(readTableAround(tablePath(dir, 'demo180', device, 'tt'), 5e-6)).toBeUndefined();
    }
  });
});
