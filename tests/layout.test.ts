import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { REPO } from './helpers/cli.js';

const git = (...args: string[]) => execFileSync('git', args, { cwd: REPO, encoding: 'utf8' });
/** git check-ignore exits 0 when the path is ignored, 1 when it is not (git documentation). */
function ignored(path: string): boolean {
  try {
    git('check-ignore', '-q', '--no-index', path);
    return true;
  } catch {
    return false;
  }
}

describe('repository layout', () => {
  it('a top-level tables/ folder is committed with a README, and its kit folders stay ignored', () => {
    expect(git('ls-files', 'tables').trim().split('\n')).toEqual(['tables/README.md']);
    const text = readFileSync(join(REPO, 'tables', 'README.md'), 'utf8');
    expect(text).toMatch(/ingest/);
    expect(text).toMatch(/generated/);
    expect(ignored('tables/README.md')).toBe(false);
    expect(ignored('tables/demo180/n-tt.swtab')).toBe(true);
    expect(ignored('tables/mykit/p-ss.swtab')).toBe(true);
  });
});
