import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll } from 'vitest';

const made: string[] = [];

// Registered in the suite of each test file that imports this helper (vitest evaluates it per file): the file's
// temporary folders are removed once its tests are done, so `npm test` leaves nothing behind in the temp folder.
afterAll(() => {
  for (const dir of made.splice(0)) rmSync(dir, { recursive: true, force: true });
});

/** A fresh folder `<tmp>/<prefix>XXXXXX`, removed after the tests of the file that asked for it. */
export function scratchDir(prefix: string): string {
  const dir = mkdtempSync(join(tmpdir(), prefix));
  made.push(dir);
  return dir;
}
