import { admissibleStands, admissibleTriangles, type PhaseMoves } from './admissibleTriangles.js';
import { admissibleTiling } from './admissibleTiling.js';
import { BoundedCache, deepFreeze } from '../shared/boundedCache.js';
import type { Point } from '../geometry/clarke.js';
import { diagramScale } from '../geometry/diagramScale.js';
import { shellClassifier, type VectorShell } from './classifyVectors.js';
import { dwellMatrix, type DwellMatrix } from '../geometry/dwell.js';
import type { Phase } from '../netlist/faults.js';
import { convexHull, polygonArea } from '../geometry/hull.js';
import type { LevelMove } from '../leg/commutation.js';
import type { LevelSets, PhasePolarity } from '../leg/legTable.js';
import { parsePolarity, type PolarityString } from '../leg/polarity.js';
import { hullGeometry, minRadialExtent, type HullGeometry } from '../geometry/radialExtent.js';
import type { LimitRules } from '../leg/rules.js';
import { sharedSurvivingVectors, vectorFinder, type SpaceVector } from './survivingVectors.js';
import type { OutlineEdge } from '../geometry/triangleUnion.js';
import { triangleArea, triangulate, type Triangle } from '../geometry/triangulate.js';

/** A surviving vector with its healthy-diagram class. */
export interface ClassifiedVector extends SpaceVector {
  /** Shell name from the healthy diagram (`small`, `large`, …). */
  readonly class: string;
}

/** Everything the planner knows about one polarity string. */
export interface PolarityDiagram {
  readonly polarity: PolarityString;
  /** Phase level sets used (per phase, for that phase's polarity). */
  readonly phaseLevels: readonly [readonly number[], readonly number[], readonly number[]];
  readonly vectors: readonly ClassifiedVector[];
  /** Hull vertex indices into `vectors`, counter-clockwise, no collinear points. */
  readonly hull: readonly number[];
  /** The tiling a modulator uses: admissible triangles (Delaunay under `levelSteps: any`). */
  readonly triangles: readonly Triangle[];
  /** Dwell-time matrix per triangle (same order as `triangles`), built on first read. */
  readonly dwell: readonly DwellMatrix[];
  /** min over all θ of r(θ): the largest origin-centred circle inside the hull (0 if degenerate). */
  readonly radius: number;
  /** Hull edge (two indices into `vectors`) that sets `radius`, `null` when radius is 0. */
  readonly radiusEdge: readonly [number, number] | null;
  /** Healthy vectors missing here, with their healthy class. */
  readonly lost: readonly ClassifiedVector[];
  /** Healthy realising triplets missing here (redundancy lost even where the vector survives). */
  readonly lostTriplets: number;
  /** Radial geometry of the tiling: the extent e(θ) the limit uses. */
  readonly geometry: HullGeometry;
  /** Radial geometry of the convex hull (the convex-hull bound): the extent behind `mMaxHull`. */
  readonly hullGeometry: HullGeometry;
  /** min over θ of the extent of the union of all admissible triangles (contract `reach`). */
  readonly reach: number;
  /**
   * Outline of the tiling when it does not fill the convex hull (references are clamped to it),
   * `null` when the tiling is the hull's triangulation.
   */
  readonly outline: readonly OutlineEdge[] | null;
  /** False when the tiling could not reach as far as the union of admissible triangles everywhere. */
  readonly exactTiling: boolean;
}

/** What one phase offers a diagram: its level sets and, per polarity character, its level moves. */
export interface PhaseOffer {
  readonly levels: LevelSets;
  readonly moves: Readonly<Record<PhasePolarity, readonly LevelMove[]>>;
  /**
   * Optional cache key per polarity character, equal for equal levels and moves (saves building
   * one per polarity string); made from `levels` and `moves` when absent.
   */
  readonly keys?: Readonly<Record<PhasePolarity, string>>;
  /**
   * Optional: the moves between neighbouring levels only, for a polarity character (cheap where the
   * full `moves` are costly). When given, a diagram whose Delaunay triangles are all admissible under
   * these alone is built without reading `moves` (it is the same diagram: more moves cannot remove
   * an admissible triangle, and a standing Delaunay tiling does not depend on the rest).
   */
  readonly adjacent?: (c: PhasePolarity) => readonly LevelMove[];
}

/**
 * The cache key of what one phase offers for one polarity character.
 *
 * @param offer - levels and moves of the phase
 * @param c - polarity character
 * @param options - `withMoves`: whether the moves matter (not under `levelSteps: any`)
 * @returns a string equal for equal offers
 * @example
 * ```ts
 * offerKey(offer, '+', { withMoves: true });
 * ```
 */
export function offerKey(offer: Pick<PhaseOffer, 'levels' | 'moves'>, c: PhasePolarity, options: { readonly withMoves: boolean }): string {
  const { withMoves } = options;
  return `${offer.levels[c].join(',')}${withMoves ? `;${offer.moves[c].map((m) => `${m[0]}>${m[1]}`).join(',')}` : ''}`;
}

/**
 * Builds the surviving vectors, hull, admissible tiling and dwell matrices for one polarity string.
 *
 * Under `levelSteps: any` the tiling is the Delaunay triangulation of the surviving vectors and the
 * extent is the convex hull's (the convex-hull bound). Otherwise the triangles are admissible: when
 * every Delaunay triangle already is, the Delaunay tiling stands (it covers the hull, so the union
 * of admissible triangles too) and the extent is the hull's; else the admissible triangles are
 * enumerated and tiled (`admissibleTiling`), and the extent is the tiling's outline.
 *
 * @param phases - per phase a, b, c: level sets and level moves
 * @param polarity - polarity string, e.g. `+-?`
 * @param healthy - vectors of the healthy diagram, for lost-vector reporting
 * @param shells - healthy shells for classification
 * @param rules - level-step rule (`ratings` is already applied in the level sets)
 * @param cache - diagrams already built, keyed by phase level sets and moves: polarity strings that
 *   select the same sets share one diagram (a fault in one phase leaves most strings alike), so pass
 *   one map per set of `healthy`/`shells`/`rules` to build each distinct diagram once
 * @returns the diagram
 * @example
 * ```ts
 * polarityDiagram(offers, '+--', healthyVectors, shells, DEFAULT_RULES).reach;
 * ```
 */
// Stage keys (see polarityDiagram) whose Delaunay triangles did not all stand: go to the full moves.
const NEEDS_FULL = new BoundedCache<true>(4096);

export function polarityDiagram(
  phases: Readonly<Record<Phase, PhaseOffer>>,
  polarity: PolarityString,
  healthy: readonly SpaceVector[],
  shells: readonly VectorShell[],
  rules: LimitRules,
  cache?: { get(key: string): PolarityDiagram | undefined; set(key: string, d: PolarityDiagram): unknown },
): PolarityDiagram {
  const [pa, pb, pc] = parsePolarity(polarity);
  const phaseLevels = [phases.a.levels[pa], phases.b.levels[pb], phases.c.levels[pc]] as const;
  const withMoves = rules.levelSteps !== 'any';
  const part = (o: PhaseOffer, c: PhasePolarity) => o.keys?.[c] ?? offerKey(o, c, { withMoves });
  const fullKey = () => `${part(phases.a, pa)}|${part(phases.b, pb)}|${part(phases.c, pc)}`;
  // First stage, where the offers give neighbour moves: keyed by levels and those moves only, valid
  // only for a diagram whose Delaunay triangles stand under them (see PhaseOffer.adjacent).
  const adj =
    withMoves && phases.a.adjacent && phases.b.adjacent && phases.c.adjacent
      ? ([phases.a.adjacent(pa), phases.b.adjacent(pb), phases.c.adjacent(pc)] as PhaseMoves)
      : null;
  const stageKey = adj ? `A|${stagePart(phases.a, pa)}|${stagePart(phases.b, pb)}|${stagePart(phases.c, pc)}` : null;
  if (stageKey) {
    const known = cache?.get(stageKey);
    if (known) return withPolarity(known, polarity);
  }
  if (!stageKey || NEEDS_FULL.get(stageKey) !== undefined) {
    const known = cache?.get(fullKey());
    if (known) return withPolarity(known, polarity);
  }
  // tolerances follow the size of the diagram, so that a leg written at another scale of potential
  // gives the same answer scaled (the healthy vectors' extent is the link's scale)
  const scale = diagramScale(healthy);
  const raw = sharedSurvivingVectors(phaseLevels, scale);
  const shellOf = shellClassifier(shells, scale);
  // frozen as made: the diagram is cached frozen, and a fresh object freezes cheaper than a walk
  const vectors = raw.map((v) => Object.freeze({ alpha: v.alpha, beta: v.beta, levels: v.levels, class: shellOf(v) }));
  const points: Point[] = vectors.map((v) => [v.alpha, v.beta]);
  const hull = convexHull(points, scale);
  const delaunay = triangulate(points, scale);
  const convex = hullGeometry(points, hull, scale);
  const min = minRadialExtent(convex, 0, 2 * Math.PI);
  const e = min.edge === null ? null : convex.edges[min.edge];
  let key = stageKey;
  let tiling: Tiling | null = null;
  if (stageKey && adj) {
    const stands = admissibleStands(vectors, adj);
    if (delaunay.length > 0 && delaunay.every(stands)) tiling = { triangles: delaunay, geometry: convex, reach: min.value, outline: null, exact: true };
    else NEEDS_FULL.set(stageKey, true);
  }
  if (!tiling) {
    key = fullKey();
    const known = cache?.get(key);
    if (known) return withPolarity(known, polarity);
    const moves: PhaseMoves = [phases.a.moves[pa], phases.b.moves[pb], phases.c.moves[pc]];
    tiling = tile(vectors, points, delaunay, hull, convex, min.value, moves, rules, scale);
  }
  // nothing is lost where the vectors are the healthy set itself (the healthy diagram's)
  const { lost, lostTriplets } = raw === healthy ? { lost: [], lostTriplets: 0 } : losses(phaseLevels, vectors, healthy, shellOf, scale);
  const triangles = tiling.triangles;
  let dwell: readonly DwellMatrix[] | undefined;
  const diagram: PolarityDiagram = {
    polarity,
    phaseLevels,
    vectors,
    hull,
    triangles,
    // built on first read (and frozen then): a plan of a many-level leg reads none of the thousands
    // of matrices its diagrams would hold; a table, a modulator or an export reads them all
    get dwell(): readonly DwellMatrix[] {
      return (dwell ??= deepFreeze(triangles.map((t) => dwellMatrix(points, t))));
    },
    radius: min.value,
    radiusEdge: e ? [e.from, e.to] : null,
    lost,
    lostTriplets,
    geometry: tiling.geometry,
    hullGeometry: convex,
    reach: tiling.reach,
    outline: tiling.outline,
    exactTiling: tiling.exact,
  };
  cache?.set(key as string, diagram);
  return diagram;
}

// One phase's part of a first-stage key (levels and neighbour moves), made once per offer and
// polarity character: the 25 polarity strings of an atlas share three offers.
function stagePart(o: PhaseOffer, c: PhasePolarity): string {
  let parts = STAGE_PARTS.get(o);
  if (!parts) STAGE_PARTS.set(o, (parts = new Map()));
  let k = parts.get(c);
  if (k === undefined) {
    k = `${o.levels[c].join(',')};${(o.adjacent?.(c) ?? []).map((m) => `${m[0]}>${m[1]}`).join(',')}`;
    parts.set(c, k);
  }
  return k;
}

const STAGE_PARTS = new WeakMap<PhaseOffer, Map<PhasePolarity, string>>();

// Healthy vectors missing from a diagram, and healthy realising triplets missing from it.
function losses(
  phaseLevels: PolarityDiagram['phaseLevels'],
  vectors: readonly SpaceVector[],
  healthy: readonly SpaceVector[],
  shellOf: (v: SpaceVector) => string,
  scale: number,
): Pick<PolarityDiagram, 'lost' | 'lostTriplets'> {
  const find = vectorFinder(vectors, scale);
  const lost = healthy.filter((h) => find([h.alpha, h.beta]) < 0).map((v) => ({ ...v, class: shellOf(v) }));
  // the surviving triplets are the whole product of the three level sets, so a healthy triplet is
  // missing exactly when one of its levels is missing from its phase's set
  const [sa, sb, sc] = phaseLevels.map((l) => new Set(l));
  const lostTriplets = healthy.reduce((n, h) => n + h.levels.filter((t) => !(sa!.has(t[0]) && sb!.has(t[1]) && sc!.has(t[2]))).length, 0);
  return { lost, lostTriplets };
}

// A cached diagram under another polarity string's name. Written out as one literal (not a spread,
// which would run the dwell getter, nor copied descriptors, which leave a slow object): the copies
// share the diagram's dwell matrices, built once on the first read through any of them.
function withPolarity(d: PolarityDiagram, polarity: PolarityString): PolarityDiagram {
  return {
    polarity,
    phaseLevels: d.phaseLevels,
    vectors: d.vectors,
    hull: d.hull,
    triangles: d.triangles,
    get dwell(): readonly DwellMatrix[] {
      return d.dwell;
    },
    radius: d.radius,
    radiusEdge: d.radiusEdge,
    lost: d.lost,
    lostTriplets: d.lostTriplets,
    geometry: d.geometry,
    hullGeometry: d.hullGeometry,
    reach: d.reach,
    outline: d.outline,
    exactTiling: d.exactTiling,
  };
}

interface Tiling {
  readonly triangles: readonly Triangle[];
  readonly geometry: HullGeometry;
  readonly reach: number;
  readonly outline: readonly OutlineEdge[] | null;
  readonly exact: boolean;
}

function tile(
  vectors: readonly SpaceVector[],
  points: readonly Point[],
  delaunay: readonly Triangle[],
  hull: readonly number[],
  convex: HullGeometry,
  radius: number,
  moves: PhaseMoves,
  rules: LimitRules,
  scale: number,
): Tiling {
  const whole = { triangles: delaunay, geometry: convex, reach: radius, outline: null, exact: true };
  if (rules.levelSteps === 'any') return whole;
  const stands = admissibleStands(vectors, moves);
  if (delaunay.length > 0 && delaunay.every(stands)) return whole;
  const t = admissibleTiling(points, admissibleTriangles(vectors, moves, points, scale), 1e-9 * scale, delaunay);
  // a tiling that fills the hull has the hull as its region: keep the hull's geometry and clamp
  const area = t.triangles.reduce((acc, tri) => acc + triangleArea(points, tri), 0);
  const hullPts = hull.map((i) => points[i] as Point);
  if (hullPts.length >= 3 && area >= polygonArea(hullPts) - 1e-9 * scale * scale) return { ...whole, triangles: t.triangles };
  return { triangles: t.triangles, geometry: t.geometry, reach: t.reach, outline: t.outline, exact: t.exact };
}
