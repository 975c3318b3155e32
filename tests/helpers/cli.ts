import { spawnSync } from 'node:child_process';
import { createRequire } from 'node:module';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { buildDemoTables } from '../../scripts/build-demo-tables.js';
import { loadKit, type Kit } from '../../src/index.js';

export const REPO = join(import.meta.dirname, '..', '..');

/**
 * tsx's loader for `node --import`, by absolute URL: a bare `--import tsx` is resolved from the child's working
 * folder, which some tests set to a temporary folder with no node_modules above it.
 */
export const TSX = pathToFileURL(createRequire(import.meta.url).resolve('tsx')).href;

/** Make sure the demo kits' tables exist (skips when up to date). */
export function ensureDemoTables(): void {
  buildDemoTables(REPO, join(REPO, 'tables'), () => {});
}

/** A demo kit from the repository's built tables (call ensureDemoTables first, e.g. in beforeAll). */
export function demoKit(name: string): Kit {
  return loadKit(name, { tables: join(REPO, 'tables') });
}

/** Both demo kits, tables built first when needed, and their supplies (V). */
export function demoKits(): { kits: Record<'demo180' | 'demo090', Kit>; supply: Record<'demo180' | 'demo090', number> } {
  ensureDemoTables();
  return { kits: { demo180: demoKit('demo180'), demo090: demoKit('demo090') }, supply: { demo180: 1.8, demo090: 1.2 } };
}

export interface CliRun {
  code: number;
  stdout: string;
  stderr: string;
}

/** Run the CLI from source (tsx), as a user would run the installed command. */
export function cli(args: string[], opts: { cwd?: string; env?: Record<string, string> } = {}): CliRun {
  const r = spawnSync(process.execPath, ['--import', TSX, join(REPO, 'src', 'cli', 'main.ts'), ...args], {
    cwd: opts.cwd ?? REPO,
    env: { ...process.env, NO_COLOR: '1', ...opts.env },
    encoding: 'utf8',
    timeout: 120_000,
  });
  return { code: r.status ?? -1, stdout: r.stdout, stderr: r.stderr };
}
