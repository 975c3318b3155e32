/**
 * The library's front door: the few calls a script needs, the same ones the CLI uses.
 * Re-exports only; the code lives in the layers.
 *
 * @example
 *   import { loadKit, sizeSpec, parseSpec } from 'stackwright';
 *   const spec = parseSpec(text, 'spec.yaml');
 *   const { result } = sizeSpec(spec, loadKit(spec.kit));
 */
export { loadKit, type Kit } from './solve/load-kit.js';
export { sizeStack, sizeDesign, sizeSpec, type SizeRun, type SizeStackResult } from './solve/size.js';
export { sizeSpecParallel, type ParallelOptions } from './solve/parallel.js';
export { startSizeWorker } from './solve/size-worker-start.js';
export { decidingResults } from './solve/choose.js';
export { portSpec, type PortRun, type PortStack } from './solve/port.js';
export { sizeStage, type SizeStageResult } from './solve/stage-size.js';
export { decidingStages } from './solve/stage-choose.js';
export type { PortStage } from './solve/port.js';
