/**
 * Synthetic characterisation sweeps for the invented demo kits of the
 * fictional foundry "Larkspur Microsystems" (not a real process).
 */
export { BOLTZMANN, ELEMENTARY_CHARGE, thermalVoltage, oxideCapacitance } from './thermal.js';
export { inversionCharge, normalisedCurrent } from './charge.js';
export type { DeviceParams, CornerDef, EkvParams, KitDef, MismatchDef } from './params.js';
export { atCorner } from './params.js';
export type { Bias, EkvState } from './ekv.js';
export { ekvCurrent, ekvState, slopeFactor, thresholdVoltage, specificCurrent, saturationCharge } from './ekv.js';
export type { Capacitances } from './capacitance.js';
export { capacitances } from './capacitance.js';
export type { DeviceValues } from './device.js';
export { evalDevice, centralDifferences, DIFF_STEP } from './device.js';
export type { Small } from './derivatives.js';
export { smallSignal } from './derivatives.js';
export { DEMO_KITS, DEMO_KIT_NAMES, FOUNDRY, INVENTED_NOTE, SYNTH_VERSION } from './kits.js';
export { lookupKit } from './lookup.js';
export { SYNTH_COLUMNS, synthCsv, sweepVolts, fmt6 } from './csv.js';
export { kitJson, csvFileName } from './kit-json.js';
export { synthReadme } from './readme.js';
export type { SynthFile } from './files.js';
export { synthKitFiles, synthAllFiles, writeSynthKits } from './files.js';
