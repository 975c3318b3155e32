'use strict';
/**
 * Starts the bundled CLI (stackwright-bundle.cjs beside this file) from V8's code cache
 * (stackwright-bundle.cjs.<command>.cache, made by `npm run build` with this machine's node), so
 * V8 deserialises the compiled code instead of parsing ~0.5 MB of JavaScript at each
 * start. V8 checks the cache against its own version, flags and the source length and
 * rejects a cache that does not fit (another node, a rebuilt bundle): the script is then
 * simply compiled from source, as without a cache. scripts/bundle-cli.ts copies this file
 * to dist/cli/stackwright.cjs, which `bin` points at.
 */
// V8 flags for a short run (scripts/v8-flags.cjs, copied beside this file), set before the bundle is compiled, so the
// code caches (trained through this launcher) carry the same flags and stay valid.
const flags = require('./v8-flags.cjs').v8FlagsFor(Number(process.versions.node.split('.')[0]));
if (flags) require('node:v8').setFlagsFromString(flags);
const { readFileSync, writeFileSync } = require('node:fs');
const { join } = require('node:path');
const { Script } = require('node:vm');
const { pathToFileURL } = require('node:url');

const file = join(__dirname, 'stackwright-bundle.cjs');
// One cache per command the build trained (V8 deserialises a whole cache, so each holds only what its command runs).
const command = process.argv[2];
const cacheFile = `${file}.${command === 'size' || command === 'probe' ? command : 'other'}.cache`;
// esbuild writes ASCII only, so latin1 reads the same text without UTF-8 decoding.
const source = readFileSync(file, 'latin1');
let cachedData;
try {
  cachedData = readFileSync(cacheFile);
} catch {
  cachedData = undefined;
}
// The bundle is ESM compiled to CommonJS: import.meta.url becomes a parameter of its wrapper.
const script = new Script(`(function (exports, require, module, __filename, __dirname, __swImportMetaUrl) {${source}\n})`, { filename: file, cachedData });
if (process.env.STACKWRIGHT_DEBUG_CODE_CACHE) process.stderr.write(`code cache: ${cachedData === undefined ? 'none' : script.cachedDataRejected ? 'rejected' : 'accepted'}\n`);
// The build writes the cache after a training run, so it holds the functions a run compiles, not only the top level.
if (process.env.STACKWRIGHT_WRITE_CODE_CACHE === cacheFile) process.once('exit', () => writeFileSync(cacheFile, script.createCachedData()));
const bundle = { exports: {} };
// The bundle lies beside this file, so this file's require resolves its externals (papaparse, ml-regression) alike.
script.runInThisContext()(bundle.exports, require, bundle, file, __dirname, pathToFileURL(file).href);
