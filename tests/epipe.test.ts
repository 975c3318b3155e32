import { describe, expect, it } from 'vitest';
import { spawn } from 'node:child_process';
import { join } from 'node:path';
import { ensureDemoTables, REPO, TSX } from './helpers/cli.js';

// A reader that closes the pipe early (`stackwright kits | head -1`): Unix tools stop quietly on a broken pipe
// (common practice; POSIX write() fails with EPIPE once the read end is closed).
describe('a closed output pipe', () => {
  it('kits and size stop quietly when the reader has gone: exit 0, no stack trace', async () => {
    ensureDemoTables();
    for (const args of [['kits', '--tables', join(REPO, 'tables')], ['size', join(REPO, 'demo-tables', 'specs', 'marsh-wren.yaml'), '--brief', '--tables', join(REPO, 'tables')]]) {
      const child = spawn(process.execPath, ['--import', TSX, join(REPO, 'src', 'cli', 'main.ts'), ...args], { cwd: REPO, stdio: ['ignore', 'pipe', 'pipe'] });
      // Close the read end before the CLI writes anything: its first write fails with EPIPE.
      child.stdout.destroy();
      let stderr = '';
      child.stderr.on('data', (d) => (stderr += d));
      const code = await new Promise<number | null>((resolve) => child.on('close', resolve));
      expect(stderr, args[0]).not.toMatch(/EPIPE|Unhandled|at /);
      expect(code, args[0]).toBe(0);
    }
  }, 120_000);
});
