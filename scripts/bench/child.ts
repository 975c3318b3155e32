import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';

/**
 * How to start a sibling script in a fresh node: the compiled .js directly,
 * or the .ts through tsx while iterating (tsx adds its own memory and start-up).
 */
export function nodeArgsFor(moduleUrl: string, sibling: string): string[] {
  const here = fileURLToPath(moduleUrl);
  const ts = here.endsWith('.ts');
  const path = fileURLToPath(new URL(`./${sibling}.${ts ? 'ts' : 'js'}`, moduleUrl));
  return ts ? ['--import', 'tsx', path] : [path];
}

/** Run node with args; return stdout, or throw with stderr's last line. */
export function runNode(args: string[], cwd: string): string {
  const r = spawnSync(process.execPath, args, { cwd, encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 });
  if (r.status !== 0) {
    const last = (r.stderr || r.stdout || '').trim().split('\n').pop() ?? '';
    throw new Error(`node ${args.join(' ')} exited ${r.status}: ${last}`);
  }
  return r.stdout;
}
