import { mkdirSync, statSync } from 'node:fs';
import { dirname, resolve } from 'node:path';

/**
 * `mkdir -p` one level at a time from the nearest existing ancestor. Node's own
 * recursive mkdir loops without end where mkdir answers ENOENT for a parent that
 * exists (as under /proc), so a bad output path would hang instead of failing.
 * Throws the first mkdir error as it is (with its code).
 */
export function makeFolders(dir: string): void {
  const missing: string[] = [];
  let at = resolve(dir);
  for (;;) {
    try {
      statSync(at);
      break; // exists; mkdir below reports a file in the way as EEXIST / ENOTDIR
    } catch (e) {
      if ((e as NodeJS.ErrnoException).code !== 'ENOENT') throw e;
    }
    missing.push(at);
    const up = dirname(at);
    if (up === at) break;
    at = up;
  }
  if (missing.length === 0) {
    if (!statSync(at).isDirectory()) mkdirSync(at); // throws EEXIST: a file is in the way
    return;
  }
  for (const d of missing.reverse()) mkdirSync(d);
}
