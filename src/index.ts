/**
 * stackwright: gm/ID lookup-table sizing of cascode current sources and sinks.
 * Sizes are first-cut estimates; verify them with the foundry models across
 * corners before tape-out.
 */
export { loadKit, sizeStack, sizeStage, sizeSpec, sizeSpecParallel, portSpec, decidingResults } from './api.js';
export type { Kit, SizeRun, ParallelOptions, PortRun, PortStack, PortStage } from './api.js';
export type { StageResult, StageSide, StagePredicted, StageCurvePoint, StageCorner, StageVerdict, StageTarget, StageSquareLaw, StageFrontPoint } from './solve/stage-types.js';
export type { Harder, StageHarder } from './solve/index.js';
export { stageNetlist } from './spice/index.js';
export { probe, sliceAt, vgsFor, designCurves } from './device/index.js';
export type { OperatingPoint, LengthSlice, ProbeQuery, ProbeResult } from './device/index.js';
export { ingestFiles, ingestTexts, parseSweep, QUANTITIES } from './ingest/index.js';
export type { IngestOptions, Quantity } from './ingest/index.js';
export { writeTable, readTable, loadTable, listKits, kitInventory, tablePath, RegularGridInterpolator } from './table/index.js';
export type { DeviceTable, TableMeta, Polarity, MismatchCoefficients, KitSummary, TableSummary } from './table/index.js';
export { parseSpec, resolveCorners } from './design/index.js';
export { TOPOLOGIES, registerTopology, topologyOf, topologyNames } from './topology/index.js';
export type { TopologyDescriptor, ScreenTools, StageOption, StageBias, Candidate } from './topology/index.js';
export type { DesignSpec, StackSpec, Topology, Objective, StageSpec, StageSideSpec, InputTopology, StageObjective } from './design/index.js';
export { sizeDesign, evaluateAtCorner, paretoFront, pelgromSigma, CAUTION } from './solve/index.js';
export { kitAccessFromTables, kitAccessFromSources } from './solve/kit-tables.js';
export type { TableSource } from './solve/kit-tables.js';
export type { KitAccess, SizeResult, StackResult, DeviceResult, BiasResult, CurvePoint, Predicted, CornerResult, FrontPoint, Verdict, VerdictTarget } from './solve/index.js';
export { stackNetlist, designNetlist } from './spice/index.js';
export { confirmStacks, confirmItems, stackItem, withCorrection } from './confirm/index.js';
export type { Confirmation, ConfirmItem, ConfirmOptions, Simulated, SimulatedFigures, Miss, CorrectedDesign } from './confirm/index.js';
export { htmlReport, renderSizeText, lineChart } from './report/index.js';
export { parseEng, formatEng, formatSpice } from './units/index.js';
export { StackwrightError, EXIT } from './errors.js';
export { writeSynthKits, DEMO_KIT_NAMES } from './synth/index.js';
