import { StackwrightError } from '../errors.js';
import type { StackSpec } from '../design/types.js';
import type { StackResult } from '../solve/types.js';
import type { KitAccess } from '../solve/kit.js';
import { evaluateAtCorner } from '../solve/evaluate/corners.js';

/** What the tables predict for a design (same W, L and bias diodes) at one corner. */
export interface TableFigures {
  iout: number;
  rout: number;
  headroom: number;
  /** Absolute gate voltages its bias diodes give there, V. */
  gates: number[];
}

/** The one place correction asks the tables: the design re-evaluated with its own bias diodes. Null when the tables cannot cover it. */
export function tableFigures(design: StackResult, spec: StackSpec, kit: KitAccess, corner: string, supply: number): TableFigures | null {
  try {
    const r = evaluateAtCorner(design, spec, kit, corner, supply);
    const p = r.predicted;
    if (!Number.isFinite(p.iout)) return null;
    return { iout: p.iout, rout: p.rout, headroom: p.headroom, gates: r.gates };
  } catch (e) {
    if (e instanceof StackwrightError && e.kind === 'range') return null;
    throw e;
  }
}
