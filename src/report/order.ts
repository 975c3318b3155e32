import type { StackResult } from '../solve/types.js';

/**
 * An alternative whose output-stack area is at least this many times the chosen one's is
 * marked: with a few hundred µm² against a few µm², it is rarely what a designer wants.
 */
export const FAR_AREA_RATIO = 3;

/** Results grouped by stack name in first-seen order, each group's chosen design first. */
export function chosenFirst(stacks: readonly StackResult[]): StackResult[] {
  const names = [...new Set(stacks.map((s) => s.name))];
  return names.flatMap((n) => {
    const mine = stacks.filter((s) => s.name === n);
    return [...mine.filter((s) => s.chosen !== false), ...mine.filter((s) => s.chosen === false)];
  });
}

/** Area of `alt` over the chosen design of its stack, when it is far above it (≥ FAR_AREA_RATIO); else undefined. */
export function farAreaRatio(alt: StackResult, all: readonly StackResult[]): number | undefined {
  if (alt.chosen !== false) return undefined;
  const chosen = all.find((s) => s.name === alt.name && s.chosen === true);
  if (!chosen) return undefined;
  const r = alt.predicted.area / chosen.predicted.area;
  return Number.isFinite(r) && r >= FAR_AREA_RATIO ? r : undefined;
}

/** "area 12× the chosen" for a far alternative. */
export function farAreaNote(ratio: number): string {
  return `area ${Number(ratio.toPrecision(2))}× the chosen`;
}
