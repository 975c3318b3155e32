export { parseSpec, resolveCorners, keyPath } from './parse.js';
export type { DesignSpec, StackSpec, Topology, Objective } from './types.js';
