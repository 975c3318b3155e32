import { StackwrightError } from '../errors.js';
import type { TopologyDescriptor } from './types.js';

const registry = new Map<string, TopologyDescriptor>();

/** Add a topology; its name must be new and not 'auto'. */
export function registerTopology(d: TopologyDescriptor): void {
  if (d.name === 'auto' || registry.has(d.name)) throw new StackwrightError(`topology "${d.name}" is already taken`, { kind: 'internal' });
  if (d.roles.length !== d.setpoints + 1 && !d.bottomDiode) {
    // Low-voltage biasing fixes every drain below the top one.
    throw new StackwrightError(`topology "${d.name}": ${d.roles.length} devices need ${d.roles.length - 1} VDS setpoints`, { kind: 'internal' });
  }
  registry.set(d.name, d);
}

/** The descriptor of a registered topology; throws kind 'internal' for an unknown name. */
export function topologyOf(name: string): TopologyDescriptor {
  const d = registry.get(name);
  if (!d) throw new StackwrightError(`unknown topology "${name}" (registered: ${topologyNames().join(', ')})`, { kind: 'internal' });
  return d;
}

/** Registered topology names in registration order ('auto' tries them all). */
export function topologyNames(): string[] {
  return [...registry.keys()];
}
