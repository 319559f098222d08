import { faultTexts } from '../leg/analyseLeg.js';
import { diagramAtlas } from '../vectors/diagramAtlas.js';
import { legLevels } from '../netlist/expandElements.js';
import { lineRmsVolts, modulationOfLineRms, phasePeakVolts, requireVdc } from '../shared/physicalUnits.js';
import { HexsalvageInputError } from '../shared/errors.js';
import { limitOverLoadAngles } from './modulationLimit.js';
import type { PolarityDiagram } from '../vectors/polarityDiagram.js';
import { resolveRules, type LevelStepRule, type LimitRules } from '../leg/rules.js';
import { requireObject } from '../shared/validate.js';

/** A derating claim: the leg keeps at least modulation index `m` over a load-angle range. */
export interface DeratingClaim {
  readonly name: string;
  /** Built-in topology id or a netlist object. */
  readonly topology: unknown;
  readonly faults: readonly string[];
  /** Promised modulation index (units of Vdc/2); give it or `lineRmsV` with `vdc`. */
  readonly m?: number;
  /** Total DC-link voltage in volts: the verdict then also reads in volts. */
  readonly vdc?: number;
  /** Promised line-to-line RMS voltage in volts instead of `m` (needs `vdc`): m = lineRmsV / ((vdc/2)·√(3/2)). */
  readonly lineRmsV?: number;
  /** [LO, HI] in degrees, −180 ≤ LO ≤ HI ≤ 180. */
  readonly loadAngleDeg: readonly [number, number];
  /** Default 0. */
  readonly polarityMarginDeg?: number;
  /** Level-step rule of the verdict. Default `commutable`. */
  readonly levelSteps?: LevelStepRule;
  /** Skip the device-rating check (unsafe: the convex-hull bound's level tables). Default false. */
  readonly ignoreRatings?: boolean;
  /** A phase tied to the DC midpoint by a fitted bypass (`a`, `b` or `c`). Default none. */
  readonly bypass?: 'a' | 'b' | 'c';
}

/** The verdict on one claim. */
export interface ClaimVerdict {
  readonly name: string;
  readonly holds: boolean;
  /** A load angle of the range where mMax is smallest. */
  readonly worstLoadAngleDeg: number;
  /** min of mMax over the range. */
  readonly mMaxAtWorst: number;
  /** max(0, m − mMaxAtWorst). */
  readonly shortfall: number;
  readonly m: number;
  readonly limitingAngleDeg: number;
  readonly limitingPolarity: string;
  /** min over the range of the convex-hull bound (not safe by itself), for comparison. */
  readonly mMaxHullAtWorst: number;
  /** The rules the verdict was made under. */
  readonly rules: LimitRules;
  /**
   * Devices of the claim's leg without a voltage rating: the rating check passes them unchecked
   * (all of them on a netlist that rates none, where `rules.ratings` checks nothing).
   */
  readonly unrated: readonly string[];
  /** How many devices the claim's leg has (to say whether the rating check covered any). */
  readonly deviceCount: number;
  /** The binding outline edge as its two vectors' level triplets and classes, or null. */
  readonly bindingEdge:
    readonly { readonly alpha: number; readonly beta: number; readonly class: string; readonly levels: readonly (readonly number[])[] }[] | null;
  /** The leg's DC potentials, ascending: how the binding edge's vectors are written (`levelNotation`). */
  readonly dcLevels: readonly number[];
  /** The claim's own inputs, for a review table: topology (id or netlist name), faults, range, margin. */
  readonly topology: string;
  readonly faults: readonly string[];
  readonly loadAngleDeg: readonly [number, number];
  readonly polarityMarginDeg: number;
  /** With `vdc`: the promise and the limit in volts. */
  readonly volts?: {
    readonly vdc: number;
    readonly lineRmsPromised: number;
    readonly lineRmsAtWorst: number;
    readonly phasePeakAtWorst: number;
    readonly shortfallLineRms: number;
  };
}

/**
 * Decides a derating claim exactly over its whole load-angle range.
 *
 * @param claim - the claim
 * @returns holds or not, the worst load angle, the limit there, the shortfall and the binding edge
 * @throws HexsalvageInputError on a bad topology, fault, m or range
 * @example
 * ```ts
 * evaluateClaim({ name: 'pump', topology: 'npc', faults: ['a.outerUpper'], m: 0.55, loadAngleDeg: [0, 40] }).holds; // true
 * ```
 */
export function evaluateClaim(claim: DeratingClaim): ClaimVerdict {
  requireObject(claim, 'evaluateClaim', 'a claim object { name, topology, faults, m, loadAngleDeg }');
  if (!Array.isArray(claim.loadAngleDeg))
    throw new HexsalvageInputError('claims', String(claim.name), 'loadAngleDeg', '[LO, HI] in degrees', claim.loadAngleDeg);
  const [lo, hi] = claim.loadAngleDeg;
  const bad = (key: string, expected: string, got: unknown) => new HexsalvageInputError('claims', claim.name, key, expected, got);
  const vdc = claim.vdc === undefined ? undefined : requireVdc(claim.vdc, String(claim.name), 'vdc');
  if (claim.lineRmsV !== undefined) {
    if (claim.m !== undefined) throw bad('lineRmsV', 'either m or lineRmsV, not both', claim.lineRmsV);
    if (vdc === undefined) throw bad('vdc', 'the DC-link voltage in volts (needed with lineRmsV)', claim.vdc);
    if (!(typeof claim.lineRmsV === 'number' && Number.isFinite(claim.lineRmsV) && claim.lineRmsV >= 0))
      throw bad('lineRmsV', 'a line-to-line RMS voltage ≥ 0 in volts', claim.lineRmsV);
  }
  const m = claim.lineRmsV !== undefined && vdc !== undefined ? modulationOfLineRms(claim.lineRmsV, vdc) : claim.m;
  if (!(typeof m === 'number' && Number.isFinite(m) && m >= 0)) throw bad('m', 'a modulation index ≥ 0 (or lineRmsV with vdc)', claim.m);
  if (!(Number.isFinite(lo) && Number.isFinite(hi) && lo >= -180 && hi <= 180 && lo <= hi))
    throw bad('loadAngleDeg', '[LO, HI] with −180 ≤ LO ≤ HI ≤ 180', claim.loadAngleDeg);
  const delta = claim.polarityMarginDeg ?? 0;
  if (!(Number.isFinite(delta) && delta >= 0 && delta < 60)) throw bad('polarityMarginDeg', 'degrees in [0, 60)', delta);
  const rules = resolveRules({ levelSteps: claim.levelSteps, ignoreRatings: claim.ignoreRatings }, claim.name);
  const atlas = diagramAtlas({
    topology: claim.topology,
    faults: claim.faults,
    levelSteps: rules.levelSteps,
    ignoreRatings: !rules.ratings,
    ...(claim.bypass === undefined ? {} : { bypass: claim.bypass }),
  });
  const r = limitOverLoadAngles(atlas.faulted, lo, hi, delta);
  const hull = limitOverLoadAngles(atlas.faulted, lo, hi, delta, 'hull');
  const d = atlas.faulted.get(r.limitingPolarity) as PolarityDiagram;
  const edge = r.bindingEdge
    ? r.bindingEdge.map((i) => {
        const v = d.vectors[i] as PolarityDiagram['vectors'][number];
        return { alpha: v.alpha, beta: v.beta, class: v.class, levels: v.levels };
      })
    : null;
  // exact comparison up to the rounding of the closed-form limit
  const holds = r.mMax >= m - 1e-12;
  return {
    name: claim.name,
    holds,
    worstLoadAngleDeg: r.loadAngleDeg,
    mMaxAtWorst: r.mMax,
    shortfall: Math.max(0, m - r.mMax),
    m,
    mMaxHullAtWorst: hull.mMax,
    rules,
    unrated: atlas.analysis.unrated,
    deviceCount: atlas.analysis.leg.devices.length,
    limitingAngleDeg: r.limitingAngleDeg,
    limitingPolarity: r.limitingPolarity,
    bindingEdge: edge,
    dcLevels: legLevels(atlas.analysis.leg),
    topology: atlas.analysis.topology,
    faults: faultTexts(atlas.analysis),
    loadAngleDeg: [lo, hi],
    polarityMarginDeg: delta,
    ...(vdc === undefined
      ? {}
      : {
          volts: {
            vdc,
            lineRmsPromised: lineRmsVolts(m, vdc),
            lineRmsAtWorst: lineRmsVolts(r.mMax, vdc),
            phasePeakAtWorst: phasePeakVolts(r.mMax, vdc),
            shortfallLineRms: lineRmsVolts(Math.max(0, m - r.mMax), vdc),
          },
        }),
  };
}
