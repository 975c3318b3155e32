/**
 * Bundles the compiled CLI (dist/src/cli/main.js) into dist/cli/: one entry file plus
 * one chunk per lazily loaded command, with commander inlined. Node's ESM loader pays
 * per file and per CommonJS package imported from ESM; `probe` then starts about 20 ms
 * sooner and `size` (which always needs yaml, so it is inlined too) about 50 ms (CPU,
 * medians of 9). The packages loaded only for ingest and charts (papaparse,
 * ml-regression, d3) stay external. `npm run build` runs it
 * after tsc; the package's `bin` points at the result.
 */
import { build } from 'esbuild';
import { rmSync } from 'node:fs';
import { join } from 'node:path';
import { packageRoot } from '../src/table/locate.js';

export const CLI_BUNDLE = join('dist', 'cli', 'stackwright.mjs');

export async function bundleCli(root = packageRoot()): Promise<string> {
  const outdir = join(root, 'dist', 'cli');
  rmSync(outdir, { recursive: true, force: true });
  await build({
    // The sizing worker is an entry of its own, written beside the chunks that start it (size-worker-start.ts).
    entryPoints: { stackwright: join(root, 'dist', 'src', 'cli', 'main.js'), 'size-worker': join(root, 'dist', 'src', 'solve', 'size-worker.js') },
    outdir,
    bundle: true,
    splitting: true,
    format: 'esm',
    platform: 'node',
    target: 'node20',
    outExtension: { '.js': '.mjs' },
    external: ['papaparse', 'ml-regression', 'd3-*'],
    // commander is CommonJS and calls require(); give the bundle one.
    banner: { js: "import { createRequire as __swRequire } from 'node:module';\nconst require = __swRequire(import.meta.url);" },
    logLevel: 'warning',
  });
  return join(root, CLI_BUNDLE);
}

if (process.argv[1] && /bundle-cli\.(js|ts)$/.test(process.argv[1])) {
  bundleCli().then((file) => process.stderr.write(`bundled ${file}\n`));
}
