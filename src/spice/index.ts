export { stackNetlist, designNetlist, stackLines, fingers, MAX_FINGER_WIDTH, DEFAULT_MODELS, SWEEP_SOURCE, SWEEP_NODE, PROBE_PREFIX, type NetlistOptions } from './netlist.js';
export { characterisationDeck, CHAR_COLUMNS, DEFAULT_DATA_FILE, DEFAULT_PINS, dataFileFor, devicePath, type CharacterisationOptions, type Pin, type SweepRange } from './characterise.js';
export { characterisationCsv } from './characterise-csv.js';
export { characterise } from './characterise-run.js';
export { runNgspice, firstError, type NgspiceRun, type RunOptions } from './run.js';
export { parseWrdata, type WrdataTable } from './wrdata.js';
export { includeLines, librarySections, modelLine } from './include.js';
export {
  simulateStacks,
  simulateSweep,
  withSweepOutput,
  probesOf,
  routOf,
  interpolateCurve,
  midSpan,
  measuredHeadroom,
  simulateOp,
  type OpPoint,
  type SweepPoint,
  type RoutPoint,
  type SimulatedStack,
  type HeadroomTargets,
} from './measure.js';
export { stageNetlist, STAGE_INPUT_SOURCE, STAGE_INPUT_NODE, STAGE_OUTPUT_NODE, type StageNetlistOptions } from './stage-netlist.js';
export { simulateStage, measuredGain, type TransferPoint, type MeasuredGain } from './stage-measure.js';
