/**
 * Bundles the compiled CLI (dist/src/cli/main.js) into dist/cli/ as one CommonJS file
 * (stackwright-bundle.cjs: commander, yaml and d3 inlined; each command's code runs only
 * when that command is asked for) and makes V8's code caches for it by training runs.
 * dist/cli/stackwright.cjs (scripts/cli-launcher.cjs, which `bin` points at) compiles the
 * bundle with the cache of the command asked for, and without it when node rejects it.
 * On node 20 only a CommonJS script can use a code cache (vm.Script cachedData); ES modules are parsed at
 * every start, and an ES module entry alone starts node's ESM loader (about 8 ms).
 * dist/cli/stackwright.mjs stays as a one-line ES module that starts the same launcher.
 * The CJS packages loaded only for ingest (papaparse, ml-regression) stay external.
 * `npm run build` and `prepare` run it after tsc.
 */
import { build, type BuildOptions, type Plugin } from 'esbuild';
import { spawnSync } from 'node:child_process';
import { chmodSync, copyFileSync, existsSync, mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { dirname, extname, join } from 'node:path';
import { packageRoot } from '../src/table/locate.js';

export const CLI_BUNDLE = join('dist', 'cli', 'stackwright.cjs');
/** The bundle beside the launcher. */
export const BUNDLE_NAME = 'stackwright-bundle.cjs';

/**
 * The training run of each code cache (see scripts/cli-launcher.cjs): `size` parses and
 * checks a spec, sizes it and prints the brief account; `other` serves every other command.
 */
export const TRAINING: Record<string, string[]> = {
  size: ['size', join('demo-tables', 'specs', 'marsh-wren.yaml'), '--brief'],
  probe: ['probe', '--kit', 'demo180', '--device', 'n', '--l', '0.5u', '--gmid', '12'],
  other: ['--version'],
};

/** The code cache the launcher uses for a command (`size`, `probe` or `other`). */
export function codeCacheFile(outdir: string, command: string): string {
  return join(outdir, `${BUNDLE_NAME}.${command}.cache`);
}

/**
 * Writes the bundle, its launchers and its code caches to `outdir` (default dist/cli) from
 * `entry` (default the tsc output; the TypeScript source works too) and returns the launcher.
 */
export async function bundleCli(root = packageRoot(), opts: { entry?: string; outdir?: string } = {}): Promise<string> {
  const outdir = opts.outdir ?? join(root, 'dist', 'cli');
  rmSync(outdir, { recursive: true, force: true });
  mkdirSync(outdir, { recursive: true });
  const bundle = join(outdir, BUNDLE_NAME);
  const entry = opts.entry ?? join(root, 'dist', 'src', 'cli', 'main.js');
  // Less text to read and hash; names are kept so an internal error's stack stays readable.
  const common: BuildOptions = {
    bundle: true, platform: 'node', target: 'node20', minifyWhitespace: true, minifySyntax: true, charset: 'ascii',
    external: ['papaparse', 'ml-regression'], logLevel: 'warning',
  };
  await build({
    ...common,
    entryPoints: [entry],
    outfile: bundle,
    format: 'cjs',
    // The launcher passes the bundle's own URL (see scripts/cli-launcher.cjs).
    define: { 'import.meta.url': '__swImportMetaUrl' },
    plugins: [lazyChildProcessForCommander],
  });
  // The sizing worker (src/solve/size-worker.ts) is a bundle of its own beside the CLI bundle: a worker thread
  // is started from a file, and size-worker-start.ts finds it by the starter's extension (.cjs -> .mjs here).
  await build({
    ...common,
    entryPoints: [join(dirname(entry), '..', 'solve', `size-worker${extname(entry)}`)],
    outfile: join(outdir, 'size-worker.mjs'),
    format: 'esm',
    banner: { js: "import { createRequire as __swRequire } from 'node:module';\nconst require = __swRequire(import.meta.url);" },
  });
  // main.ts starts with a #! line, which is a syntax error inside the launcher's function wrapper.
  writeFileSync(bundle, readFileSync(bundle, 'latin1').replace(/^#!/, '//'), 'latin1');

  const launcher = join(outdir, 'stackwright.cjs');
  copyFileSync(join(root, 'scripts', 'cli-launcher.cjs'), launcher);
  copyFileSync(join(root, 'scripts', 'v8-flags.cjs'), join(outdir, 'v8-flags.cjs'));
  writeFileSync(launcher, `#!/usr/bin/env node\n${readFileSync(launcher, 'utf8')}`);
  chmodSync(launcher, 0o755);
  const esmEntry = join(outdir, 'stackwright.mjs');
  writeFileSync(esmEntry, "#!/usr/bin/env node\nimport { createRequire } from 'node:module';\ncreateRequire(import.meta.url)('./stackwright.cjs');\n");
  chmodSync(esmEntry, 0o755);

  for (const [command, args] of Object.entries(TRAINING)) writeCodeCache(root, launcher, args, codeCacheFile(outdir, command));
  return launcher;
}

/**
 * commander requires node:child_process at load time but spawns only for executable
 * subcommands, which stackwright has none of; loading it (with net, dgram and their
 * kin) costs every start. Its require gets an object that loads the module on first use.
 */
const lazyChildProcessForCommander: Plugin = {
  name: 'lazy-child-process-for-commander',
  setup(b) {
    b.onResolve({ filter: /^node:child_process$/ }, (args) =>
      /[\\/]commander[\\/]/.test(args.importer) ? { path: 'lazy-child-process', namespace: 'stackwright' } : undefined);
    b.onLoad({ filter: /^lazy-child-process$/, namespace: 'stackwright' }, () => ({
      contents: "let m; module.exports = new Proxy({}, { get: (_t, k) => (m ??= require('node:child_process'))[k] });",
      loader: 'js',
      resolveDir: '.',
    }));
  },
};

/**
 * Runs the CLI once so the launcher writes the code cache at exit. `prepare` builds the
 * demo tables first; without them a training run stops at the kit and its cache holds
 * less (the CLI works the same either way).
 */
function writeCodeCache(root: string, launcher: string, args: string[], cacheFile: string): void {
  const r = spawnSync(process.execPath, [launcher, ...args], {
    cwd: root,
    env: { ...process.env, STACKWRIGHT_WRITE_CODE_CACHE: cacheFile, NO_COLOR: '1' },
    stdio: ['ignore', 'ignore', 'pipe'],
    encoding: 'utf8',
  });
  if (!existsSync(cacheFile)) process.stderr.write(`bundle-cli: no code cache ${cacheFile} (the CLI starts without it): ${r.stderr.trim().split('\n').pop() ?? ''}\n`);
}

if (process.argv[1] && /bundle-cli\.(js|ts)$/.test(process.argv[1])) {
  bundleCli().then((file) => process.stderr.write(`bundled ${file}\n`));
}
