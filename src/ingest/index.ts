export { QUANTITIES } from './types.js';
export type { IngestOptions, Quantity, Samples, SweepOptions } from './types.js';
export { parseSweep } from './parse-sweep.js';
export { ingestFiles, ingestTexts } from './ingest.js';
export type { SweepInput } from './ingest.js';
export { pchip, pchipSlopes, hermiteAt } from './pchip.js';
export { slopeStencil, slopeAt } from './slope.js';
export type { SlopeStencil } from './slope.js';
export { deriveAlong } from './derive.js';
