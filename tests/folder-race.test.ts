import { mkdirSync, mkdtempSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it, vi } from 'vitest';
import { ensureFolder } from '../src/fsutil.js';

// Two processes writing into one new kit folder: both stat it as missing, both mkdir it, and the slower
// one gets EEXIST for a folder that is now there. To make the race happen on purpose, the first stat of a
// folder named "raced" says ENOENT after another "process" (this mock) has created it.
const raced = new Set<string>();
vi.mock('node:fs', async (importOriginal) => {
  const fs = await importOriginal<typeof import('node:fs')>();
  const statSync = ((p: string, ...rest: unknown[]) => {
    const s = String(p);
    if (s.endsWith('raced') && !raced.has(s)) {
      raced.add(s);
      fs.mkdirSync(s); // the other writer wins the race here
      throw Object.assign(new Error(`ENOENT: ${s}`), { code: 'ENOENT' });
    }
    return (fs.statSync as (...a: unknown[]) => unknown)(p, ...rest);
  }) as typeof fs.statSync;
  return { ...fs, statSync, default: { ...fs, statSync } };
});

const dir = mkdtempSync(join(tmpdir(), 'sw-race-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('ensureFolder under a concurrent creator', () => {
  it('a folder made by another process between the check and mkdir is accepted', () => {
    const target = join(dir, 'kit', 'raced');
    mkdirSync(join(dir, 'kit'));
    expect(() => ensureFolder(target)).not.toThrow();
    expect(raced.has(target)).toBe(true); // the race really happened
    expect(statSync(target).isDirectory()).toBe(true);
  });

  it('a plain file in the way is still refused with EEXIST named', () => {
    const file = join(dir, 'blocker');
    writeFileSync(file, 'x');
    expect(() => ensureFolder(file)).toThrow(/cannot create folder .*blocker: a file of that name is in the way \(EEXIST\)/);
  });
});
