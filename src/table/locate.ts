import { existsSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { StackwrightError } from '../errors.js';
import { listKits } from './store.js';

/** The package's own folder (holding the bundled demo tables and specs). */
export function packageRoot(): string {
  let dir = dirname(fileURLToPath(import.meta.url));
  for (let i = 0; i < 5; i++) {
    if (existsSync(join(dir, 'package.json'))) return dir;
    dir = dirname(dir);
  }
  return process.cwd();
}

/**
 * Where to find tables: an explicit folder; else ./tables when it has the kit;
 * else the tables built into the package at install time (the demo kits).
 */
export function tablesDirFor(kit: string | undefined, explicit?: string): string {
  if (explicit) {
    if (!existsSync(explicit)) throw new StackwrightError(`tables folder ${explicit} does not exist`, { where: '--tables' });
    return explicit;
  }
  const local = resolve('tables');
  const bundled = join(packageRoot(), 'tables');
  if (kit !== undefined) {
    for (const dir of [local, bundled]) if (existsSync(dir) && listKits(dir).includes(kit)) return dir;
  }
  return existsSync(local) ? local : bundled;
}
