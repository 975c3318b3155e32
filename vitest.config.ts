import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

export default defineConfig({
  // The package's own name resolves to the sources, so tests never run against a stale dist/.
  resolve: { alias: { stackwright: fileURLToPath(new URL('./src/index.ts', import.meta.url)) } },
  test: {
    include: ['tests/**/*.test.ts'],
    testTimeout: 120_000,
    hookTimeout: 300_000,
    pool: 'forks',
  },
});
