export type { KitAccess } from './kit.js';
export { sizeStack, sizeDesign, sizeSpec, type SizeRun, type SizeStackResult } from './size.js';
export { loadKit, type Kit } from './load-kit.js';
export { parseSizeResult } from './parse-result.js';
export { portSpec, type PortRun, type PortStack } from './port.js';
export type { Harder } from './compare.js';
export type { StageHarder } from './stage-port.js';
export { evaluateAtCorner } from './evaluate/corners.js';
export { paretoFront, frontDominates, type FrontPoint } from './pareto.js';
export { pelgromSigma } from './evaluate/mismatch.js';
export { CURRENT_WINDOW } from '../policy.js';
export type { Verdict, VerdictTarget } from './evaluate/verdict.js';
export { CAUTION } from './types.js';
export type {
  Role, DeviceResult, BiasResult, CurvePoint, Predicted, SquareLawCheck, CornerResult, StackResult, SizeResult,
} from './types.js';
