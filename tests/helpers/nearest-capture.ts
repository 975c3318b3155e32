import type * as NearestModule from '../../src/solve/nearest.js';
import type { Nearest } from '../../src/solve/nearest.js';

/** The nearest points the search handed to the report, in order (a test empties it with `captured.length = 0`). */
export const captured: Nearest[] = [];

/**
 * The nearest-points module with nearestPoints recording each answer into `captured`, for a test file's mock:
 *   vi.mock('../src/solve/nearest.js', async (importOriginal) => (await import('./helpers/nearest-capture.js')).capturing(await importOriginal()));
 */
export function capturing(m: typeof NearestModule): typeof NearestModule {
  return {
    ...m,
    nearestPoints: (...a: Parameters<typeof m.nearestPoints>) => {
      const r = m.nearestPoints(...a);
      captured.push(r);
      return r;
    },
  };
}
