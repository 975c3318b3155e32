/**
 * All files of the invented "Larkspur Microsystems" demo kits, in memory,
 * and writing them to disk atomically.
 */
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { gzip, gzipSync } from 'node:zlib';
import { StackwrightError } from '../errors.js';
import { ensureFolder, writeFileAtomic } from '../fsutil.js';
import { synthCsv } from './csv.js';
import { csvFileName, kitJson } from './kit-json.js';
import { DEMO_KIT_NAMES } from './kits.js';
import type { KitDef } from './params.js';
import { lookupKit } from './lookup.js';
import { synthReadme } from './readme.js';

export interface SynthFile {
  /** Relative to the output folder, `/`-separated. */
  path: string;
  contents: Buffer;
}

const gzipAsync = promisify(gzip);
const GZIP = { level: 9 } as const;

function csvTargets(kit: KitDef): Array<{ path: string; device: 'n' | 'p'; corner: string }> {
  return (['n', 'p'] as const).flatMap((device) =>
    Object.keys(kit.corners).map((corner) => ({ path: `${kit.kit}/${csvFileName(device, corner)}`, device, corner })),
  );
}

function textFiles(kits: readonly string[]): SynthFile[] {
  return [
    { path: 'README.md', contents: Buffer.from(synthReadme(), 'utf8') },
    ...kits.map((k) => ({ path: `${k}/kit.json`, contents: Buffer.from(kitJson(lookupKit(k)), 'utf8') })),
  ];
}

/** kit.json and every gzip-compressed CSV of one kit. */
export function synthKitFiles(kitName: string): SynthFile[] {
  const kit = lookupKit(kitName);
  const files: SynthFile[] = [{ path: `${kit.kit}/kit.json`, contents: Buffer.from(kitJson(kit), 'utf8') }];
  for (const t of csvTargets(kit)) {
    files.push({ path: t.path, contents: gzipSync(Buffer.from(synthCsv(kit.kit, t.device, t.corner), 'utf8'), GZIP) });
  }
  return files;
}

/** Every kit plus README.md. */
export function synthAllFiles(kits: readonly string[] = DEMO_KIT_NAMES): SynthFile[] {
  return [textFiles([])[0], ...kits.flatMap(synthKitFiles)];
}

/**
 * Write README.md and every kit under outDir. Checks every target first so a
 * refusal leaves nothing half-written; each file goes through temp + rename.
 * Compression runs on the zlib thread pool while the next CSV is generated.
 * Resolves to the relative paths written.
 */
export async function writeSynthKits(outDir: string, opts: { force?: boolean; kits?: readonly string[] } = {}): Promise<string[]> {
  const kits = (opts.kits ?? DEMO_KIT_NAMES).map((k) => lookupKit(k));
  const targets = kits.flatMap(csvTargets);
  const text = textFiles(kits.map((k) => k.kit));
  const paths = [...text.map((f) => f.path), ...targets.map((t) => t.path)];
  if (!opts.force) {
    const taken = paths.map((p) => join(outDir, p)).filter((p) => existsSync(p));
    if (taken.length > 0) {
      const more = taken.length > 1 ? ` (and ${taken.length - 1} more)` : '';
      throw new StackwrightError(`${taken[0]} exists${more}; pass --force to overwrite`, { kind: 'exists' });
    }
  }
  // Every folder first: a bad --out fails before any CSV is generated.
  for (const k of kits) ensureFolder(join(outDir, k.kit));
  const pending: Array<Promise<void>> = [];
  for (const t of targets) {
    const kit = t.path.split('/')[0];
    const csv = Buffer.from(synthCsv(kit, t.device, t.corner), 'utf8');
    const job = gzipAsync(csv, GZIP).then((gz) => writeFileAtomic(join(outDir, t.path), gz, { force: opts.force }));
    job.catch(() => undefined); // handled by Promise.all below; avoids an early unhandled rejection
    pending.push(job);
    // Yield so finished compressions get written while the next CSV is built.
    await new Promise<void>((r) => setImmediate(r));
  }
  await Promise.all(pending);
  for (const f of text) writeFileAtomic(join(outDir, f.path), f.contents, { force: opts.force });
  return paths;
}
