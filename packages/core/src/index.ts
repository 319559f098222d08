export { HexsalvageInputError, type InputErrorCode } from './shared/errors.js';
export { type NumberRange } from './shared/validate.js';
export type { DeviceKind, DeviceSpec, LegElement, LegNetlist, SwitchingClass } from './netlist/netlist.js';
export { BUILTIN_TOPOLOGIES, builtinLeg, isBuiltinTopology, type BuiltinTopology } from './netlist/builtinLegs.js';
export { parseNetlist } from './netlist/parseNetlist.js';
export { parseJsonText } from './shared/parseJsonText.js';
export { FAULT_MODES, PHASES, formatFault, parseFault, type Fault, type FaultMode, type Phase, type PhaseFaults } from './netlist/faults.js';
export { type ConductionEdge, type CurrentSign, type ShootThrough, type SignOutcome } from './leg/conduction.js';
export { type LegTable, type LevelSets, type PatternResult, type PhasePolarity } from './leg/legTable.js';
export { analyseLeg, type AnalyseLegOptions, type BypassState, type LegAnalysis } from './leg/analyseLeg.js';
export { legDocument, type LegDocument, type LegDocumentPattern } from './vectors/legDocument.js';
export { type LevelTriplet, type Point } from './geometry/clarke.js';
export { POLARITY_STRINGS, parsePolarity, type PolarityString } from './leg/polarity.js';
export { type SpaceVector } from './vectors/survivingVectors.js';
export { type Triangle } from './geometry/triangulate.js';
export { type HullEdge, type HullGeometry, type RadialValue } from './geometry/radialExtent.js';
export { polarityAt, type PolaritySector } from './vectors/polaritySectors.js';
export { type DwellMatrix } from './geometry/dwell.js';
export { type VectorShell } from './vectors/classifyVectors.js';
export { type ClassifiedVector, type PhaseOffer, type PolarityDiagram } from './vectors/polarityDiagram.js';
export { type DiagramAtlas } from './vectors/diagramAtlas.js';
export { modulationLimit, type ExtentKind, type LimitOverRange, type ModulationLimit } from './limits/modulationLimit.js';
export { CAUTIONS } from './shared/cautions.js';
export {
  planRemedial,
  polarityDocument,
  type PlanOptions,
  type PlanPolarity,
  type PlanSector,
  type PlanStop,
  type PlanVector,
  type RemedialPlan,
} from './limits/planRemedial.js';
export { deratingCurve, deratingSteps, type DeratingCurveOptions, type DeratingPoint, type DeratingStepsOptions } from './limits/deratingCurve.js';
export { LEVEL_STEP_RULES, describeRules, unsafeRules, type LevelStepRule, type LimitRuleOptions, type LimitRules } from './leg/rules.js';
export { type RatingCheck } from './leg/ratingCheck.js';
export { type GateSetOutcome, type GateSetSolver, type GateSetSolverOptions } from './leg/gateSetSolver.js';
export { type LevelMove, type PhaseCommutations } from './leg/commutation.js';
export { type AdmissibleTriangle, type PhaseMoves } from './vectors/admissibleTriangles.js';
export { type AdmissibleTiling } from './vectors/admissibleTiling.js';
export { type OutlineEdge, type Segment } from './geometry/triangleUnion.js';
export { type MidpointProfile } from './limits/midpointBalance.js';
export { exploreLeg, type ExploredCombination, type LegExploration, type PhaseExploration } from './leg/exploreLeg.js';
export { type LocatableDiagram, type LocatedReference, type OutlineSegment } from './geometry/locateReference.js';
export { type PatternChoice } from './leg/choosePattern.js';
export { type MidpointSign } from './leg/midpointCurrent.js';
export {
  type LegState,
  type LevelJump,
  type PatternCandidatesOf,
  type PhaseState,
  type StepAllowed,
  type SwitchingSequence,
} from './table/switchingSequence.js';
export { type MidpointAuthority, type PolarityTable, type TableTriangle, type TableVertex, type VertexRealisation } from './table/polarityTable.js';
export { switchingTable, type SwitchingTable, type TablePolarity, type TriangleFlag } from './table/switchingTable.js';
export { REFERENCE_LIMIT, createModulator, type ModulationResult, type Modulator, type ModulatorSource } from './table/createModulator.js';
export { cycleCheck, type CycleCheckOptions, type CycleReport } from './table/cycleCheck.js';
export { exportCsv } from './export/exportCsv.js';
export { exportDocument, type ExportDocument } from './export/exportJson.js';
export { exportC, type ExportCOptions } from './export/exportC.js';
export { evaluateClaim, type ClaimVerdict, type DeratingClaim } from './limits/evaluateClaim.js';
export {
  faultAtlas,
  type AtlasClassResult,
  type AtlasEntry,
  type AtlasProgress,
  type AtlasSettings,
  type AtlasWork,
  type FaultAtlas,
  type FaultAtlasOptions,
} from './atlas/faultAtlas.js';
export { type FaultReason } from './leg/faultReason.js';
export { lineRmsVolts, modulationOfLineRms, phasePeakVolts, type PlanVolts } from './shared/physicalUnits.js';
export { levelNotation, type LevelNotation } from './vectors/levelNotation.js';
export {
  type DeviceParameters,
  type DeviceParameterSet,
  type DiodeParameters,
  type ElementParameters,
  type SwitchParameters,
} from './simulate/deviceLosses.js';
export {
  MAX_SIMULATED_PERIODS,
  simulatePeriod,
  simulationWaveform,
  type DeviceResult,
  type SimulateOptions,
  type Simulation,
  type SimulationResult,
  type WaveformSegment,
} from './simulate/simulatePeriod.js';
export { type PhaseSteps } from './table/patternSteps.js';
export { type RuntimeProgram } from './table/runtimeProgram.js';
export { SEQUENCE_MODES, createRuntime, type Runtime, type RuntimeOptions, type RuntimeOutput, type SequenceMode } from './table/createRuntime.js';
export {
  UPDATE_MODES,
  runtimeStream,
  type RuntimeStream,
  type RuntimeStreamOptions,
  type StreamEntry,
  type StreamSegment,
  type UpdateMode,
} from './table/runtimeStream.js';
export { samplePeriod, type PeriodState, type SampledPeriod, type SamplePeriodOptions } from './table/samplePeriod.js';
export {
  switchover,
  type Switchover,
  type SwitchoverCell,
  type SwitchoverClass,
  type SwitchoverExit,
  type SwitchoverOptions,
  type SwitchoverRun,
} from './table/switchover.js';
export { type BestRemedy, type Remedy, type RemedyCase } from './limits/remedies.js';
export { type PlanLimits } from './limits/planLimits.js';
export { parseFailures, type Failure } from './netlist/faults.js';
export { type JointLegTableOptions, type PhaseConfiguration } from './leg/legTable.js';
