import type { Topology } from '../design/types.js';
import type { Role } from '../solve/types.js';

/** Roles of the output devices, from the rail outwards. */
export function rolesOf(topology: Topology): Role[] {
  switch (topology) {
    case 'single':
      return ['bottom'];
    case 'cascode':
    case 'cascode-stacked':
      return ['bottom', 'top'];
    case 'triple':
      return ['bottom', 'middle', 'top'];
  }
}

/** Number of VDS setpoints the search chooses (low-voltage biasing only). */
export function setpointCount(topology: Topology): number {
  return topology === 'cascode' ? 1 : topology === 'triple' ? 2 : 0;
}
