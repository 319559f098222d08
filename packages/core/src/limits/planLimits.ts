import type { DiagramAtlas } from '../vectors/diagramAtlas.js';
import { balancedLimit, midpointProfile } from './midpointBalance.js';
import { modulationLimit, type ModulationLimit } from './modulationLimit.js';
import { hasMidpoint, legLevels } from '../netlist/expandElements.js';

/** The two limits of a plan at one load angle. */
export interface PlanLimits {
  /** The safe limit (the admissible tiling's extent, min over θ). */
  readonly mMax: number;
  /** Largest m ≤ mMax up to which the average midpoint current can be held at zero. */
  readonly mMaxBalanced: number;
  /** The limit's details (binding angle, polarity, edge, sectors). */
  readonly limit: ModulationLimit;
}

/**
 * The safe limit and the midpoint-balanced limit of a prepared atlas at one load angle (what a
 * plan reports, without the plan's documents: remedies and alternatives need only these).
 *
 * @param atlas - from `diagramAtlas`
 * @param loadAngleDeg - load angle, degrees
 * @param polarityMarginDeg - polarity margin, degrees
 * @returns mMax, mMaxBalanced and the limit's details
 * @example
 * ```ts
 * planLimits(diagramAtlas({ topology: 'npc', faults: ['a.outerUpper'] }), 0, 0).mMax; // 1/√3
 * ```
 */
export function planLimits(atlas: DiagramAtlas, loadAngleDeg: number, polarityMarginDeg: number): PlanLimits {
  // an atlas is immutable: its limits at a load angle are computed once
  let memo = MEMO.get(atlas);
  if (!memo) MEMO.set(atlas, (memo = new Map()));
  const key = `${loadAngleDeg}|${polarityMarginDeg}`;
  let r = memo.get(key);
  if (!r) {
    r = computeLimits(atlas, loadAngleDeg, polarityMarginDeg);
    if (memo.size >= 256) memo.clear();
    memo.set(key, r);
  }
  return r;
}

const MEMO = new WeakMap<DiagramAtlas, Map<string, PlanLimits>>();

function computeLimits(atlas: DiagramAtlas, loadAngleDeg: number, polarityMarginDeg: number): PlanLimits {
  const limit = modulationLimit(atlas.faulted, loadAngleDeg, polarityMarginDeg);
  const analysis = atlas.analysis;
  const midpoint = hasMidpoint(legLevels(analysis.leg));
  // a healthy leg draws no average midpoint current from a symmetric set (contract): no search
  const healthy = analysis.faults.length === 0 && analysis.bypass === null;
  const mMaxBalanced =
    healthy || !midpoint || limit.mMax <= 0 ? limit.mMax : balancedLimit(midpointProfile(atlas.faulted, limit.mMax, loadAngleDeg, polarityMarginDeg));
  return { mMax: limit.mMax, mMaxBalanced, limit };
}
