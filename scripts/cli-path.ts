import { readFileSync } from 'node:fs';
import { join } from 'node:path';

/** The command users run: package.json's `bin` (the bundled CLI after `npm run build`). */
export function cliPath(root: string): string {
  const pkg = JSON.parse(readFileSync(join(root, 'package.json'), 'utf8')) as { bin: Record<string, string> };
  return join(root, pkg.bin.stackwright);
}
