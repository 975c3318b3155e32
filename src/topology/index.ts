import { registerTopology, topologyNames } from './registry.js';
import { single } from './single.js';
import { cascode } from './cascode.js';
import { cascodeStacked } from './cascode-stacked.js';
import { triple } from './triple.js';

// One line per topology; 'auto' tries them in this order.
registerTopology(single);
registerTopology(cascode);
registerTopology(cascodeStacked);
registerTopology(triple);

/** The built-in topologies, in the order 'auto' tries them. */
export const TOPOLOGIES: readonly string[] = topologyNames();

export { registerTopology, topologyOf, topologyNames } from './registry.js';
export type { Topology, TopologyDescriptor, Candidate, StageOption, StageBias, ScreenTools, Criteria } from './types.js';
