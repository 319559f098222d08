import type { LevelTriplet, Point } from './clarke.js';
import { classifyVector, type VectorShell } from './classifyVectors.js';
import { dwellMatrix, type DwellMatrix } from './dwell.js';
import type { Phase } from './faults.js';
import { convexHull } from './hull.js';
import type { LevelSets } from './legTable.js';
import { parsePolarity, type PolarityString } from './polarity.js';
import { hullGeometry, minRadialExtent, type HullGeometry } from './radialExtent.js';
import { indexOfVector, survivingVectors, type SpaceVector } from './survivingVectors.js';
import { triangulate, type Triangle } from './triangulate.js';

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
  readonly triangles: readonly Triangle[];
  /** Dwell-time matrix per triangle (same order as `triangles`). */
  readonly dwell: readonly DwellMatrix[];
  /** min over all θ of r(θ): the largest origin-centred circle inside the hull (0 if degenerate). */
  readonly radius: number;
  /** Hull edge (two indices into `vectors`) that sets `radius`, `null` when radius is 0. */
  readonly radiusEdge: readonly [number, number] | null;
  /** Healthy vectors missing here, with their healthy class. */
  readonly lost: readonly ClassifiedVector[];
  /** Healthy realising triplets missing here (redundancy lost even where the vector survives). */
  readonly lostTriplets: number;
  readonly geometry: HullGeometry;
}

/**
 * Builds the surviving vectors, hull, triangulation and dwell matrices for one polarity string.
 *
 * @param phases - level sets of phases a, b, c
 * @param polarity - polarity string, e.g. `+-?`
 * @param healthy - vectors of the healthy diagram, for lost-vector reporting
 * @param shells - healthy shells for classification
 * @param cache - diagrams already built, keyed by phase level sets: polarity strings that select the
 *   same three level sets share one diagram (a fault in one phase leaves most strings alike), so
 *   pass one map per set of `healthy`/`shells` to build each distinct diagram once
 * @returns the diagram
 * @example
 * ```ts
 * polarityDiagram(levelsByPhase, '+--', healthyVectors, shells).radius;
 * ```
 */
export function polarityDiagram(
  phases: Readonly<Record<Phase, LevelSets>>,
  polarity: PolarityString,
  healthy: readonly SpaceVector[],
  shells: readonly VectorShell[],
  cache?: Map<string, PolarityDiagram>,
): PolarityDiagram {
  const [pa, pb, pc] = parsePolarity(polarity);
  const phaseLevels = [phases.a[pa], phases.b[pb], phases.c[pc]] as const;
  const key = JSON.stringify(phaseLevels);
  const known = cache?.get(key);
  if (known) return { ...known, polarity };
  const raw = survivingVectors(phaseLevels);
  const vectors = raw.map((v) => ({ ...v, class: classifyVector(shells, v) }));
  const points: Point[] = vectors.map((v) => [v.alpha, v.beta]);
  const hull = convexHull(points);
  const triangles = triangulate(points);
  const geometry = hullGeometry(points, hull);
  const min = minRadialExtent(geometry, 0, 2 * Math.PI);
  const e = min.edge === null ? null : geometry.edges[min.edge];
  const lost = healthy.filter((h) => indexOfVector(vectors, [h.alpha, h.beta]) < 0).map((v) => ({ ...v, class: classifyVector(shells, v) }));
  const have = new Set(vectors.flatMap((v) => v.levels.map(tripletKey)));
  const lostTriplets = healthy.reduce((n, h) => n + h.levels.filter((t) => !have.has(tripletKey(t))).length, 0);
  const diagram: PolarityDiagram = {
    polarity,
    phaseLevels,
    vectors,
    hull,
    triangles,
    dwell: triangles.map((t) => dwellMatrix(points, t)),
    radius: min.value,
    radiusEdge: e ? [e.from, e.to] : null,
    lost,
    lostTriplets,
    geometry,
  };
  cache?.set(key, diagram);
  return diagram;
}

function tripletKey(t: LevelTriplet): string {
  return t.join(',');
}
