import { spawnSync } from 'node:child_process';
import { copyFileSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { bundleCli, codeCacheFile } from '../scripts/bundle-cli.js';
import { cli, ensureDemoTables, REPO, type CliRun } from './helpers/cli.js';

/**
 * The command users run is the bundle `npm run build` makes (scripts/bundle-cli.ts): one
 * CommonJS file started from V8's code cache by a small launcher. It must answer exactly
 * as the CLI run from source does, with the cache, without it, and with a cache V8
 * refuses (node's vm.Script documentation: a cache that does not fit sets
 * cachedDataRejected and the script is compiled from source).
 */
describe('the bundled CLI answers as the CLI from source', () => {
  let dir: string;
  let launcher: string;
  let badSpec: string;
  beforeAll(async () => {
    ensureDemoTables();
    dir = mkdtempSync(join(tmpdir(), 'sw-bundle-'));
    badSpec = join(dir, 'bad.yaml');
    writeFileSync(badSpec, 'kit: demo180\nsupply: 1.8\nstacks: []\nbogus: 1\n');
    launcher = await bundleCli(REPO, { entry: join(REPO, 'src', 'cli', 'main.ts'), outdir: join(dir, 'cli') });
  }, 120_000);
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  const bundled = (args: string[], file = launcher): CliRun => {
    const r = spawnSync(process.execPath, [file, ...args], {
      cwd: REPO,
      // The bundle's externals (papaparse, ml-regression) resolve from the bundle's folder, here a temporary one: as
      // installed, dist/cli sits in the package beside its node_modules.
      env: { ...process.env, NO_COLOR: '1', STACKWRIGHT_DEBUG_CODE_CACHE: '1', NODE_PATH: join(REPO, 'node_modules') },
      encoding: 'utf8',
      timeout: 120_000,
    });
    return { code: r.status ?? -1, stdout: r.stdout, stderr: r.stderr };
  };
  /** The launcher's first stderr line says what became of the cache; the rest is the CLI's. */
  const split = (r: CliRun): { cache: string; run: CliRun } => {
    const [first, ...rest] = r.stderr.split('\n');
    return { cache: first, run: { ...r, stderr: rest.join('\n') } };
  };

  const cases = (): string[][] => [
    ['size', badSpec],
    ['size', join('demo-tables', 'specs', 'marsh-wren.yaml'), '--brief'],
    ['probe', '--kit', 'demo180', '--device', 'n', '--l', '0.5u', '--gmid', '12'],
    ['probe', '--kit', 'demo180', '--device', 'n', '--l', '0.5u'],
    ['--version'],
    ['frobnicate'],
  ];

  it('with its code cache, which V8 accepts', () => {
    for (const args of cases()) {
      const { cache, run } = split(bundled(args));
      expect(cache, args.join(' ')).toBe('code cache: accepted');
      expect(run, args.join(' ')).toEqual(cli(args));
    }
  }, 120_000);

  it('through the .mjs entry too', () => {
    const args = cases()[0];
    const { cache, run } = split(bundled(args, join(dir, 'cli', 'stackwright.mjs')));
    expect(cache).toBe('code cache: accepted');
    expect(run).toEqual(cli(args));
  }, 60_000);

  it('with a cache V8 refuses, and with none', () => {
    const cacheFile = codeCacheFile(join(dir, 'cli'), 'size');
    copyFileSync(cacheFile, `${cacheFile}.good`);
    try {
      writeFileSync(cacheFile, Buffer.alloc(4096, 7));
      const args = cases()[0];
      const refused = split(bundled(args));
      expect(refused.cache).toBe('code cache: rejected');
      expect(refused.run).toEqual(cli(args));
      rmSync(cacheFile);
      const none = split(bundled(args));
      expect(none.cache).toBe('code cache: none');
      expect(none.run).toEqual(cli(args));
    } finally {
      copyFileSync(`${cacheFile}.good`, cacheFile);
    }
  }, 60_000);
});
