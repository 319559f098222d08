/**
 * `@hexsalvage/core/internal`: the building blocks behind the public entry points, for the
 * hexsalvage packages (plot, CLI, explorer) and the tests. No stability promise: names here may
 * change in any release. Everything public is re-exported too.
 *
 * @packageDocumentation
 */
export * from './index.js';
export { fileValue, hasInvisible, plainText } from './shared/errors.js';
export { requireNumber, requireObject } from './shared/validate.js';
export { expandElements, hasMidpoint, gatedDeviceIds, legLevels, unratedDevices } from './netlist/expandElements.js';
export { NETLIST_LIMITS } from './netlist/parseNetlist.js';
export { MAX_INPUT_BYTES, MAX_INPUT_DEPTH } from './shared/parseJsonText.js';
export { resolveTopology } from './netlist/resolveTopology.js';
export { faultsByPhase } from './netlist/faults.js';
export { conductionEdges, findShootThrough, outputForSign } from './leg/conduction.js';
export { legTable, levelSets } from './leg/legTable.js';
export { faultTexts } from './leg/analyseLeg.js';
export { clarke, clarkeAlpha, clarkeBeta } from './geometry/clarke.js';
export { AREA_TOLERANCE, DWELL_TOLERANCE, VECTOR_TOLERANCE } from './shared/tolerance.js';
export { convexHull, polygonArea } from './geometry/hull.js';
export { indexOfVector, sharedSurvivingVectors, survivingVectors, vectorFinder } from './vectors/survivingVectors.js';
export { rotateToMin, triangleArea, triangulate } from './geometry/triangulate.js';
export { hullGeometry, minRadialExtent, radialExtent } from './geometry/radialExtent.js';
export { mod360, polaritySectors } from './vectors/polaritySectors.js';
export { dwellMatrix, dwellTimes } from './geometry/dwell.js';
export { classifyVector, shellClassifier, vectorShells } from './vectors/classifyVectors.js';
export { offerKey, polarityDiagram } from './vectors/polarityDiagram.js';
export { diagramAtlas, phaseMoves } from './vectors/diagramAtlas.js';
export { extentGeometry, limitOverLoadAngles } from './limits/modulationLimit.js';
export { PLAN_SCHEMA_VERSION, checkAngle, planFromAtlas, withRemedies, withVolts } from './limits/planRemedial.js';
export { DEFAULT_RULES, resolveRules } from './leg/rules.js';
export { ratingCheck, ratingChecker, reasonInWords } from './leg/ratingCheck.js';
export { gateSetSolver, usableLevel } from './leg/gateSetSolver.js';
export { commutates, patternLevel, phaseCommutations } from './leg/commutation.js';
export { admissibleChain, admissibleChecker, admissibleStands, admissibleTriangles } from './vectors/admissibleTriangles.js';
export { admissibleTiling } from './vectors/admissibleTiling.js';
export { coveredBy, segmentEntersTriangle, tilingOutline, unionOutline } from './geometry/triangleUnion.js';
export { originStrictlyInside, outlineGeometry } from './geometry/outlineGeometry.js';
export { MIDPOINT_SAMPLES, MIDPOINT_TOLERANCE, balancedLimit, midpointProfile, midpointRangeAt } from './limits/midpointBalance.js';
export { explainRestrictions, levelName } from './leg/restrictions.js';
export { EXPLORE_MAX_SWITCHES } from './leg/exploreLeg.js';
export { clampInto, clampToHull, clampToOutline, locateReference } from './geometry/locateReference.js';
export { choosePattern, patternCandidates } from './leg/choosePattern.js';
export { midpointCoefficients, midpointSign } from './leg/midpointCurrent.js';
export { chooseSequence, gateDifference } from './table/switchingSequence.js';
export { polarityTable } from './table/polarityTable.js';
export { MAX_TABLE_LEVELS, TABLE_SCHEMA_VERSION, switchingTableFromAtlas } from './table/switchingTable.js';
export { CSV_COLUMNS, csvCell, csvText } from './export/exportCsv.js';
export { EXPORT_SCHEMA_VERSION } from './export/exportJson.js';
export { ATLAS_SCHEMA_VERSION, assembleAtlas, atlasClass, atlasGrid, atlasWork, canonicalRotation } from './atlas/faultAtlas.js';
export { faultReason } from './leg/faultReason.js';
export { planVolts, requireVdc } from './shared/physicalUnits.js';
export { vectorName } from './vectors/levelNotation.js';
export { DEMO_DEVICES, conductionLoss, elementParameters, eventEnergy, parseDeviceParameters } from './simulate/deviceLosses.js';
export { POLARITY_CHARS, patternSteps } from './table/patternSteps.js';
export { MAX_CANDIDATES, runtimeProgram } from './table/runtimeProgram.js';
export { runtimeOptions } from './table/createRuntime.js';
export { SWITCHOVER_SEARCH_LIMIT } from './table/switchover.js';
export { bestRemedy, planRemedies, remedyCases } from './limits/remedies.js';
export { planLimits } from './limits/planLimits.js';
export { failureConfigurations, formatFailure, MAX_CONFIGURATIONS } from './netlist/faults.js';
export { jointLegTable } from './leg/legTable.js';
