export { fileValue, HexsalvageInputError, hasInvisible, plainText, type InputErrorCode } from './shared/errors.js';
export { requireNumber, requireObject, type NumberRange } from './shared/validate.js';
export type { DeviceKind, DeviceSpec, LegElement, LegNetlist, SwitchingClass } from './netlist/netlist.js';
export { expandElements, gatedDeviceIds, legLevels, unratedDevices } from './netlist/expandElements.js';
export { BUILTIN_TOPOLOGIES, builtinLeg, isBuiltinTopology, type BuiltinTopology } from './netlist/builtinLegs.js';
export { NETLIST_LIMITS, parseNetlist } from './netlist/parseNetlist.js';
export { MAX_INPUT_BYTES, MAX_INPUT_DEPTH, parseJsonText } from './shared/parseJsonText.js';
export { resolveTopology } from './netlist/resolveTopology.js';
export { FAULT_MODES, PHASES, faultsByPhase, formatFault, parseFault, type Fault, type FaultMode, type Phase, type PhaseFaults } from './netlist/faults.js';
export {
  conductionEdges,
  findShootThrough,
  outputForSign,
  type ConductionEdge,
  type CurrentSign,
  type ShootThrough,
  type SignOutcome,
} from './leg/conduction.js';
export { legTable, levelSets, type LegTable, type LevelSets, type PatternResult, type PhasePolarity } from './leg/legTable.js';
export { analyseLeg, faultTexts, type AnalyseLegOptions, type BypassState, type LegAnalysis } from './leg/analyseLeg.js';
export { legDocument, type LegDocument, type LegDocumentPattern } from './vectors/legDocument.js';
export { clarke, clarkeAlpha, clarkeBeta, type LevelTriplet, type Point } from './geometry/clarke.js';
export { AREA_TOLERANCE, DWELL_TOLERANCE, VECTOR_TOLERANCE } from './shared/tolerance.js';
export { convexHull, polygonArea } from './geometry/hull.js';
export { POLARITY_STRINGS, parsePolarity, type PolarityString } from './leg/polarity.js';
export { indexOfVector, sharedSurvivingVectors, survivingVectors, vectorFinder, type SpaceVector } from './vectors/survivingVectors.js';
export { rotateToMin, triangleArea, triangulate, type Triangle } from './geometry/triangulate.js';
export { hullGeometry, minRadialExtent, radialExtent, type HullEdge, type HullGeometry, type RadialValue } from './geometry/radialExtent.js';
export { mod360, polarityAt, polaritySectors, type PolaritySector } from './vectors/polaritySectors.js';
export { dwellMatrix, dwellTimes, type DwellMatrix } from './geometry/dwell.js';
export { classifyVector, shellClassifier, vectorShells, type VectorShell } from './vectors/classifyVectors.js';
export { offerKey, polarityDiagram, type ClassifiedVector, type PhaseOffer, type PolarityDiagram } from './vectors/polarityDiagram.js';
export { diagramAtlas, phaseMoves, type DiagramAtlas } from './vectors/diagramAtlas.js';
export { extentGeometry, limitOverLoadAngles, modulationLimit, type ExtentKind, type LimitOverRange, type ModulationLimit } from './limits/modulationLimit.js';
export { CAUTIONS } from './shared/cautions.js';
export {
  PLAN_SCHEMA_VERSION,
  checkAngle,
  planFromAtlas,
  planRemedial,
  polarityDocument,
  withRemedies,
  withVolts,
  type PlanOptions,
  type PlanPolarity,
  type PlanSector,
  type PlanStop,
  type PlanVector,
  type RemedialPlan,
} from './limits/planRemedial.js';
export { deratingCurve, deratingSteps, type DeratingCurveOptions, type DeratingPoint, type DeratingStepsOptions } from './limits/deratingCurve.js';
export {
  DEFAULT_RULES,
  LEVEL_STEP_RULES,
  describeRules,
  resolveRules,
  unsafeRules,
  type LevelStepRule,
  type LimitRuleOptions,
  type LimitRules,
} from './leg/rules.js';
export { ratingCheck, ratingChecker, reasonInWords, type RatingCheck } from './leg/ratingCheck.js';
export { gateSetSolver, usableLevel, type GateSetOutcome, type GateSetSolver } from './leg/gateSetSolver.js';
export { commutates, patternLevel, phaseCommutations, type LevelMove, type PhaseCommutations } from './leg/commutation.js';
export {
  admissibleChain,
  admissibleChecker,
  admissibleStands,
  admissibleTriangles,
  type AdmissibleTriangle,
  type PhaseMoves,
} from './vectors/admissibleTriangles.js';
export { admissibleTiling, type AdmissibleTiling } from './vectors/admissibleTiling.js';
export { coveredBy, segmentEntersTriangle, tilingOutline, unionOutline, type OutlineEdge, type Segment } from './geometry/triangleUnion.js';
export { originStrictlyInside, outlineGeometry } from './geometry/outlineGeometry.js';
export { MIDPOINT_SAMPLES, MIDPOINT_TOLERANCE, balancedLimit, midpointProfile, midpointRangeAt, type MidpointProfile } from './limits/midpointBalance.js';
export { explainRestrictions, levelName } from './leg/restrictions.js';

export { EXPLORE_MAX_SWITCHES, exploreLeg, type ExploredCombination, type LegExploration, type PhaseExploration } from './leg/exploreLeg.js';
export {
  clampInto,
  clampToHull,
  clampToOutline,
  locateReference,
  type LocatableDiagram,
  type LocatedReference,
  type OutlineSegment,
} from './geometry/locateReference.js';
export { choosePattern, patternCandidates, type PatternChoice } from './leg/choosePattern.js';
export { midpointCoefficients, midpointSign, type MidpointSign } from './leg/midpointCurrent.js';
export {
  chooseSequence,
  gateDifference,
  type LegState,
  type LevelJump,
  type PatternCandidatesOf,
  type PhaseState,
  type StepAllowed,
  type SwitchingSequence,
} from './table/switchingSequence.js';
export {
  polarityTable,
  type MidpointAuthority,
  type PolarityTable,
  type TableTriangle,
  type TableVertex,
  type VertexRealisation,
} from './table/polarityTable.js';
export {
  MAX_TABLE_LEVELS,
  TABLE_SCHEMA_VERSION,
  switchingTable,
  switchingTableFromAtlas,
  type SwitchingTable,
  type TablePolarity,
  type TriangleFlag,
} from './table/switchingTable.js';
export { REFERENCE_LIMIT, createModulator, type ModulationResult, type Modulator, type ModulatorSource } from './table/createModulator.js';
export { cycleCheck, type CycleCheckOptions, type CycleReport } from './table/cycleCheck.js';
export { CSV_COLUMNS, csvCell, csvText, exportCsv } from './export/exportCsv.js';
export { EXPORT_SCHEMA_VERSION, exportDocument, type ExportDocument } from './export/exportJson.js';
export { exportC, type ExportCOptions } from './export/exportC.js';
export { evaluateClaim, type ClaimVerdict, type DeratingClaim } from './limits/evaluateClaim.js';
export {
  ATLAS_SCHEMA_VERSION,
  assembleAtlas,
  atlasClass,
  atlasGrid,
  atlasWork,
  canonicalRotation,
  faultAtlas,
  type AtlasClassResult,
  type AtlasEntry,
  type AtlasProgress,
  type AtlasSettings,
  type AtlasWork,
  type FaultAtlas,
  type FaultAtlasOptions,
} from './atlas/faultAtlas.js';
export { faultReason, type FaultReason } from './leg/faultReason.js';
export { lineRmsVolts, modulationOfLineRms, phasePeakVolts, planVolts, requireVdc, type PlanVolts } from './shared/physicalUnits.js';
export { levelNotation, vectorName, type LevelNotation } from './vectors/levelNotation.js';
export {
  DEMO_DEVICES,
  conductionLoss,
  elementParameters,
  eventEnergy,
  parseDeviceParameters,
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
export { POLARITY_CHARS, patternSteps, type PhaseSteps } from './table/patternSteps.js';
export { MAX_CANDIDATES, runtimeProgram, type RuntimeProgram } from './table/runtimeProgram.js';
export {
  SEQUENCE_MODES,
  createRuntime,
  runtimeOptions,
  type Runtime,
  type RuntimeOptions,
  type RuntimeOutput,
  type SequenceMode,
} from './table/createRuntime.js';
export { UPDATE_MODES, runtimeStream, type RuntimeStream, type RuntimeStreamOptions, type StreamSegment, type UpdateMode } from './table/runtimeStream.js';
export { samplePeriod, type PeriodState, type SampledPeriod, type SamplePeriodOptions } from './table/samplePeriod.js';
export {
  switchover,
  SWITCHOVER_SEARCH_LIMIT,
  type Switchover,
  type SwitchoverCell,
  type SwitchoverClass,
  type SwitchoverExit,
  type SwitchoverOptions,
  type SwitchoverRun,
} from './table/switchover.js';
export { bestRemedy, planRemedies, remedyCases, type BestRemedy, type Remedy, type RemedyCase } from './limits/remedies.js';
export { planLimits, type PlanLimits } from './limits/planLimits.js';
export { failureConfigurations, formatFailure, MAX_CONFIGURATIONS, parseFailures, type Failure } from './netlist/faults.js';
export { jointLegTable, type JointLegTableOptions, type PhaseConfiguration } from './leg/legTable.js';
