export { QUANTITIES } from './types.js';
export type { IngestOptions, Quantity, Samples, SweepOptions } from './types.js';
export { parseSweep } from './parse-sweep.js';
export { ingestFiles, ingestTexts, type IngestedTable } from './ingest.js';
export type { SweepInput } from './ingest.js';
export { pchip, pchipSlopes, hermiteAt } from '../numeric/pchip.js';
export { slopeStencil, slopeAt } from '../numeric/slope.js';
export type { SlopeStencil } from '../numeric/slope.js';
export { deriveAlong } from './derive.js';
