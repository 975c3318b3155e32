export { parseSpec, resolveCorners, keyPath } from './parse.js';
export type { DesignSpec, StackSpec, Topology, Objective, StageSpec, StageSideSpec, InputTopology, StageObjective } from './types.js';
export { INPUT_TOPOLOGIES } from './types.js';
