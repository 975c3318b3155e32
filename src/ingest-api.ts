/**
 * `ingest` for library users, apart from src/api.ts so that sizing and probing
 * never load the CSV importer and its dependencies.
 */
import { ingestFiles } from './ingest/index.js';
import type { IngestOptions } from './ingest/index.js';
import type { DeviceTable } from './table/types.js';

/** Read characterisation CSV files into a table (not yet written; see writeTable). */
export function ingest(paths: string[], opts: IngestOptions): DeviceTable {
  return ingestFiles(paths, opts);
}
