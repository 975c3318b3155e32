import type { TableMeta } from './types.js';

/** `kit/device/corner`, used to say which table a message is about. */
export function tableLabel(meta: Pick<TableMeta, 'kit' | 'device' | 'corner'>): string {
  return `${meta.kit}/${meta.device}/${meta.corner}`;
}
