import type { LevelTriplet } from './clarke.js';
import { CAUTIONS } from './cautions.js';
import { diagramAtlas, type DiagramAtlas } from './diagramAtlas.js';
import type { DwellMatrix } from './dwell.js';
import { HexsalvageInputError } from './errors.js';
import { formatFault, PHASES, type Phase } from './faults.js';
import type { LevelSets } from './legTable.js';
import { modulationLimit } from './modulationLimit.js';
import { POLARITY_STRINGS, type PolarityString } from './polarity.js';
import type { ClassifiedVector, PolarityDiagram } from './polarityDiagram.js';

/** Version of the plan document layout; bumped on any incompatible change. */
export const PLAN_SCHEMA_VERSION = 1;

/** Options of {@link planRemedial}. */
export interface PlanOptions {
  /** Built-in topology id or a netlist object in the file format. */
  readonly topology: unknown;
  /** Fault strings `PHASE.DEVICE[:MODE]`. Default: none (healthy). */
  readonly faults?: readonly string[];
  /** Load angle φ in degrees, −180…180, positive inductive. Default 0. */
  readonly loadAngleDeg?: number;
  /** Polarity margin δ in degrees, 0 ≤ δ < 60. Default 0. */
  readonly polarityMarginDeg?: number;
}

/** A vector as printed in plan and vectors documents. */
export interface PlanVector {
  readonly alpha: number;
  readonly beta: number;
  readonly levels: readonly LevelTriplet[];
  readonly class: string;
}

/** One polarity string's diagram as printed. */
export interface PlanPolarity {
  readonly vectors: readonly PlanVector[];
  readonly hull: readonly (readonly [number, number])[];
  readonly triangles: readonly (readonly [number, number, number])[];
  readonly radius: number;
  /** Dwell-time matrix per triangle: `[d0 d1 d2]ᵀ = M·[alpha beta 1]ᵀ`. */
  readonly dwell: readonly DwellMatrix[];
  /** Healthy vectors not available under this polarity. */
  readonly lost: readonly PlanVector[];
  readonly lostTriplets: number;
}

/** One polarity sector of the fundamental cycle at the plan's load angle. */
export interface PlanSector {
  readonly fromDeg: number;
  readonly toDeg: number;
  readonly polarity: PolarityString;
  readonly vectors: readonly PlanVector[];
  readonly triangles: readonly (readonly [number, number, number])[];
  /** Smallest r(θ) inside this sector and where. */
  readonly minExtent: number;
  readonly minExtentAngleDeg: number;
}

/** The remedial plan: what the `plan` command prints and `planRemedial` returns. */
export interface RemedialPlan {
  readonly schemaVersion: number;
  readonly topology: string;
  readonly faults: readonly string[];
  readonly loadAngleDeg: number;
  readonly polarityMarginDeg: number;
  readonly mMax: number;
  readonly mMaxHealthy: number;
  readonly deratingRatio: number;
  readonly limitingAngleDeg: number;
  readonly limitingPolarity: PolarityString;
  /** The hull edge that binds, as its two vectors; `null` when mMax is 0 because a hull is degenerate. */
  readonly bindingEdge: readonly [PlanVector, PlanVector] | null;
  readonly levels: Readonly<Record<Phase, LevelSets>>;
  readonly sectors: readonly PlanSector[];
  readonly polarities: Readonly<Record<PolarityString, PlanPolarity>>;
  readonly cautions: readonly string[];
}

/**
 * Plans remedial operation of a faulted leg: vectors per polarity, the re-triangulated diagram and
 * the exact modulation limit at one load angle.
 *
 * @param options - topology, faults, load angle and polarity margin (validated here)
 * @returns the plan document (plain data, JSON-ready)
 * @throws HexsalvageInputError on bad topology, fault, load angle or margin
 * @example
 * ```ts
 * const plan = planRemedial({ topology: 'npc', faults: ['a.outerUpper'], loadAngleDeg: 30 });
 * plan.mMax; // exact limit, units of Vdc/2
 * ```
 */
export function planRemedial(options: PlanOptions): RemedialPlan {
  const loadAngleDeg = checkAngle(options.loadAngleDeg ?? 0, 'loadAngleDeg', -180, 180, true);
  const polarityMarginDeg = checkAngle(options.polarityMarginDeg ?? 0, 'polarityMarginDeg', 0, 60, false);
  return planFromAtlas(diagramAtlas({ topology: options.topology, faults: options.faults ?? [] }), loadAngleDeg, polarityMarginDeg);
}

/**
 * Builds the plan document from a prepared atlas (lets sweeps reuse one atlas for many load angles).
 *
 * @param atlas - from `diagramAtlas`
 * @param loadAngleDeg - validated load angle
 * @param polarityMarginDeg - validated margin
 * @returns the plan document
 * @example
 * ```ts
 * planFromAtlas(diagramAtlas({ topology: 'tnpc' }), 0, 0).mMax; // 2/√3
 * ```
 */
export function planFromAtlas(atlas: DiagramAtlas, loadAngleDeg: number, polarityMarginDeg: number): RemedialPlan {
  const lim = modulationLimit(atlas.faulted, loadAngleDeg, polarityMarginDeg);
  const healthy = modulationLimit(atlas.healthy, loadAngleDeg, polarityMarginDeg);
  const polarities: Record<PolarityString, PlanPolarity> = {};
  for (const p of POLARITY_STRINGS) polarities[p] = polarityDocument(atlas.faulted.get(p) as PolarityDiagram);
  const limitDiagram = atlas.faulted.get(lim.limitingPolarity) as PolarityDiagram;
  const levels = {} as Record<Phase, LevelSets>;
  for (const ph of PHASES) levels[ph] = atlas.analysis.phases[ph].levels;
  return {
    schemaVersion: PLAN_SCHEMA_VERSION,
    topology: atlas.analysis.topology,
    faults: atlas.analysis.faults.map(formatFault),
    loadAngleDeg,
    polarityMarginDeg,
    mMax: lim.mMax,
    mMaxHealthy: healthy.mMax,
    deratingRatio: healthy.mMax > 0 ? lim.mMax / healthy.mMax : 0,
    limitingAngleDeg: lim.limitingAngleDeg,
    limitingPolarity: lim.limitingPolarity,
    bindingEdge: lim.bindingEdge ? [vectorDocument(limitDiagram.vectors[lim.bindingEdge[0]] as ClassifiedVector), vectorDocument(limitDiagram.vectors[lim.bindingEdge[1]] as ClassifiedVector)] : null,
    levels,
    sectors: lim.sectors.map((s, i) => {
      const d = atlas.faulted.get(s.polarity) as PolarityDiagram;
      const m = lim.sectorMinima[i] as { value: number; thetaDeg: number };
      return { ...s, vectors: d.vectors.map(vectorDocument), triangles: d.triangles, minExtent: m.value, minExtentAngleDeg: m.thetaDeg };
    }),
    polarities,
    cautions: CAUTIONS,
  };
}

/**
 * One polarity diagram as a plain document (the `vectors` command prints this plus `polarity`).
 *
 * @param d - a polarity diagram
 * @returns vectors, hull points, triangles, radius, dwell matrices and losses
 * @example
 * ```ts
 * polarityDocument(atlas.faulted.get('+--')!).hull;
 * ```
 */
export function polarityDocument(d: PolarityDiagram): PlanPolarity {
  return {
    vectors: d.vectors.map(vectorDocument),
    hull: d.hull.map((i) => [(d.vectors[i] as ClassifiedVector).alpha, (d.vectors[i] as ClassifiedVector).beta] as const),
    triangles: d.triangles,
    radius: d.radius,
    dwell: d.dwell,
    lost: d.lost.map(vectorDocument),
    lostTriplets: d.lostTriplets,
  };
}

function vectorDocument(v: ClassifiedVector): PlanVector {
  return { alpha: v.alpha, beta: v.beta, levels: v.levels, class: v.class };
}

/**
 * Validates an angle option.
 *
 * @param v - value
 * @param key - option name
 * @param lo - lowest allowed
 * @param hi - highest allowed
 * @param hiInclusive - whether `hi` itself is allowed
 * @returns the value
 * @example
 * ```ts
 * checkAngle(30, 'loadAngleDeg', -180, 180, true); // 30
 * ```
 */
export function checkAngle(v: unknown, key: string, lo: number, hi: number, hiInclusive: boolean): number {
  const ok = typeof v === 'number' && Number.isFinite(v) && v >= lo && (hiInclusive ? v <= hi : v < hi);
  if (!ok) throw new HexsalvageInputError('option', 'options', key, `a number of degrees in [${lo}, ${hi}${hiInclusive ? ']' : ')'}`, v);
  return v as number;
}
