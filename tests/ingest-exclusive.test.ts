import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { spawn } from 'node:child_process';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it, vi } from 'vitest';
import { StackwrightError } from '../src/errors.js';
import { ingestTexts } from '../src/ingest/index.js';
import { readTable, tablePath, writeTable } from '../src/table/index.js';
import { REPO, TSX } from './helpers/cli.js';

// The race of two processes: both check that the table does not exist, then both write. To make it happen on
// purpose, the existence check is made to answer "no" for table files, as it would for the slower process.
vi.mock('node:fs', async (importOriginal) => {
  const fs = await importOriginal<typeof import('node:fs')>();
  const existsSync = (p: Parameters<typeof fs.existsSync>[0]) => (String(p).endsWith('.swtab') ? false : fs.existsSync(p));
  return { ...fs, existsSync, default: { ...fs, existsSync } };
});

const dir = mkdtempSync(join(tmpdir(), 'sw-excl-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

// Invented square-law sweeps (Shichman–Hodges level 1 form), not data of any process.
function sweep(k: number): string {
  const rows = ['l,w,vgs,vds,vsb,id'];
  for (const l of [0.2e-6, 1e-6]) for (const g of [0.6, 0.8, 1.0, 1.2]) for (const d of [0.6, 1.2]) rows.push([l, 1e-6, g, d, 0, k * (g - 0.45) ** 2 * (1 + 0.1 * d)].join(','));
  return rows.join('\n') + '\n';
}

describe('ingest: a table is created exclusively', () => {
  it('the second of two writers that both passed the existence check gets "already exists" and the first table survives', () => {
    const first = ingestTexts([{ file: 'a.csv', text: sweep(2e-4) }], { kit: 'race', device: 'n' });
    const second = ingestTexts([{ file: 'b.csv', text: sweep(3e-4) }], { kit: 'race', device: 'n' });
    const path = writeTable(dir, first);
    let err: unknown;
    try {
      writeTable(dir, second);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(StackwrightError);
    expect((err as StackwrightError).kind).toBe('exists');
    expect((err as StackwrightError).message).toMatch(/already exists/);
    expect(readTable(path).meta.sources[0].file).toBe('a.csv');
    // With force the second one replaces it, as documented.
    writeTable(dir, second, { force: true });
    expect(readTable(tablePath(dir, 'race', 'n', 'tt')).meta.sources[0].file).toBe('b.csv');
  });

  it('two concurrent command-line ingests into one kit: exactly one writes, the other exits 2 with "already exists"', async () => {
    const { writeFileSync } = await import('node:fs');
    const a = join(dir, 'a.csv');
    const b = join(dir, 'b.csv');
    writeFileSync(a, sweep(2e-4));
    writeFileSync(b, sweep(3e-4));
    const tables = join(dir, 'cli-tables');
    const run = (file: string) =>
      new Promise<{ code: number | null; stderr: string }>((resolve) => {
        const child = spawn(process.execPath, ['--import', TSX, join(REPO, 'src', 'cli', 'main.ts'), 'ingest', file, '--kit', 'both', '--device', 'n', '--tables', tables], {
          cwd: REPO,
          env: { ...process.env, NO_COLOR: '1' },
        });
        let stderr = '';
        child.stderr.on('data', (d: Buffer) => (stderr += d.toString()));
        child.on('close', (code) => resolve({ code, stderr }));
      });
    const results = await Promise.all([run(a), run(b)]);
    const codes = results.map((r) => r.code).sort();
    expect(codes).toEqual([0, 2]);
    const loser = results.find((r) => r.code === 2)!;
    expect(loser.stderr.trim()).toMatch(/already exists.*pass --force/);
    expect(readFileSync(tablePath(tables, 'both', 'n', 'tt')).length).toBeGreaterThan(0);
  }, 60_000);
});
