import type { LevelTriplet, Point } from '../geometry/clarke.js';
import type { LevelMove } from '../leg/commutation.js';
import type { SpaceVector } from './survivingVectors.js';
import { rotateToMin, triangleArea, type Triangle } from '../geometry/triangulate.js';
import { AREA_TOLERANCE } from '../shared/tolerance.js';

/** Level moves of phases a, b and c, each for that phase's polarity character. */
export type PhaseMoves = readonly [readonly LevelMove[], readonly LevelMove[], readonly LevelMove[]];

/** A triangle that a switching sequence can run, with one witness sequence r1 → r2 → r3. */
export interface AdmissibleTriangle {
  /** Vector indices, counter-clockwise, starting at the smallest. */
  readonly vertices: Triangle;
  /** Realisations r1, r2, r3 with r1 → r2 and r2 → r3 each a one-phase level move. */
  readonly chain: readonly [LevelTriplet, LevelTriplet, LevelTriplet];
}

/**
 * Every admissible triangle of a polarity: three distinct, non-collinear
 * vectors with realisations r1, r2, r3 such that r1 → r2 and r2 → r3 each change exactly one phase
 * by a level move that phase may make.
 *
 * Enumerated from the graph of one-phase moves between realisations rather than from all vertex
 * triples: for each realisation r2, each pair of its neighbours that change two different phases
 * closes a candidate (the same phase twice would be collinear). With V realisations and at most D
 * moves from each, that is O(V·D²) candidates.
 *
 * @param vectors - surviving vectors (each with its realising triplets)
 * @param moves - per phase a, b, c: the level moves allowed for its polarity character
 * @param points - vector positions (same order as `vectors`)
 * @returns distinct admissible triangles, sorted by vertex indices
 * @example
 * ```ts
 * admissibleTriangles(vectors, [movesA, movesB, movesC], points).length;
 * ```
 */
export function admissibleTriangles(vectors: readonly SpaceVector[], moves: PhaseMoves, points: readonly Point[], scale = 1): AdmissibleTriangle[] {
  const owner = new Map<string, number>();
  vectors.forEach((v, i) => {
    for (const t of v.levels) owner.set(key(t), i);
  });
  const next = moveMaps(moves);
  const found = new Map<string, AdmissibleTriangle>();
  for (const v of vectors)
    for (const r2 of v.levels) {
      const nbrs: { phase: number; t: LevelTriplet; vec: number }[] = [];
      for (let k = 0; k < 3; k++) {
        for (const l of next[k]?.get(r2[k] as number) ?? []) {
          const t = [...r2] as [number, number, number];
          t[k] = l;
          const vec = owner.get(key(t));
          if (vec !== undefined) nbrs.push({ phase: k, t, vec });
        }
      }
      const v2 = owner.get(key(r2)) as number;
      for (let i = 0; i < nbrs.length; i++)
        for (let j = i + 1; j < nbrs.length; j++) {
          const x = nbrs[i] as (typeof nbrs)[number];
          const y = nbrs[j] as (typeof nbrs)[number];
          if (x.phase === y.phase || x.vec === y.vec || x.vec === v2 || y.vec === v2) continue;
          let tri: [number, number, number] = [x.vec, v2, y.vec];
          const area = triangleArea(points, tri);
          if (Math.abs(area) <= AREA_TOLERANCE * scale * scale) continue;
          if (area < 0) tri = [tri[0], tri[2], tri[1]];
          const rotated = rotateToMin(tri);
          const k = rotated.join(',');
          if (!found.has(k)) found.set(k, { vertices: rotated, chain: [x.t, r2, y.t] });
        }
    }
  return [...found.values()].sort((a, b) => a.vertices[0] - b.vertices[0] || a.vertices[1] - b.vertices[1] || a.vertices[2] - b.vertices[2]);
}

/**
 * Whether one triangle is admissible: some choice of middle vertex and realisations r1, r2, r3
 * with r1 → r2 and r2 → r3 each a one-phase move. The direct test, used to accept a Delaunay
 * triangulation as it is before enumerating every admissible triangle.
 *
 * @param vectors - surviving vectors
 * @param tri - three vector indices
 * @param moves - per phase, its level moves
 * @returns a witness chain, or `null` when the triangle is not admissible
 * @example
 * ```ts
 * admissibleChain(vectors, [0, 1, 2], moves) !== null;
 * ```
 */
export function admissibleChain(vectors: readonly SpaceVector[], tri: Triangle, moves: PhaseMoves): readonly [LevelTriplet, LevelTriplet, LevelTriplet] | null {
  return admissibleChecker(moves)(vectors, tri);
}

/**
 * {@link admissibleChain} with the move tables built once, for testing many triangles.
 *
 * @param moves - per phase, its level moves
 * @returns a function of the vectors and a triangle, giving a witness chain or `null`
 * @example
 * ```ts
 * const chain = admissibleChecker(moves);
 * delaunay.every((t) => chain(vectors, t) !== null);
 * ```
 */
export function admissibleChecker(
  moves: PhaseMoves,
): (vectors: readonly SpaceVector[], tri: Triangle) => readonly [LevelTriplet, LevelTriplet, LevelTriplet] | null {
  const next = moveMaps(moves);
  const step = (a: LevelTriplet, b: LevelTriplet): boolean => {
    let k = -1;
    for (let i = 0; i < 3; i++) {
      if (a[i] === b[i]) continue;
      if (k >= 0) return false;
      k = i;
    }
    return k >= 0 && (next[k]?.get(a[k] as number)?.includes(b[k] as number) ?? false);
  };
  return (vectors, tri) => {
    for (let m = 0; m < 3; m++) {
      const mid = vectors[tri[m] as number] as SpaceVector;
      const x = vectors[tri[(m + 1) % 3] as number] as SpaceVector;
      const y = vectors[tri[(m + 2) % 3] as number] as SpaceVector;
      for (const r2 of mid.levels) {
        const r1 = x.levels.find((t) => step(t, r2));
        if (!r1) continue;
        const r3 = y.levels.find((t) => step(r2, t));
        if (r3) return [r1, r2, r3];
      }
    }
    return null;
  };
}

/**
 * Whether a triangle is admissible ({@link admissibleChecker} finds a chain), decided with a look-up
 * per candidate instead of a scan of realisations: for each realisation r2 of the middle vertex and
 * each one-phase move from it, the triplet reached is looked up among all triplets of the diagram.
 * The moves are symmetric (the sequence rule needs both ways), so a move r1 → r2 exists exactly
 * when r2 → r1 does. Gives the same answer as `admissibleChecker(moves)(vectors, tri) !== null`.
 *
 * @param vectors - the diagram's vectors
 * @param moves - per phase, the level moves
 * @returns a test of a triangle
 * @example
 * ```ts
 * const stands = admissibleStands(vectors, moves);
 * delaunay.every(stands);
 * ```
 */
export function admissibleStands(vectors: readonly SpaceVector[], moves: PhaseMoves): (tri: Triangle) => boolean {
  // levels by index, and every triplet of the diagram as a code (its three level indices) → its
  // vector, in a flat table (L³ entries, a few bytes for each triplet the diagram already holds)
  const index = new Map<number, number>();
  for (let i = 0; i < vectors.length; i++) {
    const levels = (vectors[i] as SpaceVector).levels;
    for (let j = 0; j < levels.length; j++) {
      const t = levels[j] as LevelTriplet;
      for (let k = 0; k < 3; k++) if (!index.has(t[k] as number)) index.set(t[k] as number, index.size);
    }
  }
  const L = index.size;
  const owner = new Int32Array(L * L * L).fill(-1);
  // per vector, its realisations as codes
  const codes: Int32Array[] = new Array(vectors.length);
  for (let i = 0; i < vectors.length; i++) {
    const levels = (vectors[i] as SpaceVector).levels;
    const c = new Int32Array(levels.length);
    for (let j = 0; j < levels.length; j++) {
      const t = levels[j] as LevelTriplet;
      const code = ((index.get(t[0]) as number) * L + (index.get(t[1]) as number)) * L + (index.get(t[2]) as number);
      c[j] = code;
      owner[code] = i;
    }
    codes[i] = c;
  }
  // per phase, per level index: the level indices it may move to (moves to levels the diagram does
  // not use lead nowhere and are left out)
  const reach = moves.map((list) => {
    const to: number[][] = Array.from({ length: L }, () => []);
    for (let j = 0; j < list.length; j++) {
      const m = list[j] as LevelMove;
      const from = index.get(m[0]);
      const dest = index.get(m[1]);
      if (from !== undefined && dest !== undefined) (to[from] as number[]).push(dest);
    }
    return to;
  });
  const [ra, rb, rc] = reach as [number[][], number[][], number[][]];
  const LL = L * L;
  // a realisation of vector `target` one allowed phase move away from the triplet with this code:
  // phase a's index is worth L², b's L, c's 1 in the code
  const near = (code: number, target: number): boolean => {
    const ic = code % L;
    const q = (code - ic) / L;
    const ib = q % L;
    const ia = (q - ib) / L;
    return (
      hits(owner, ra[ia] as number[], code - ia * LL, LL, target) ||
      hits(owner, rb[ib] as number[], code - ib * L, L, target) ||
      hits(owner, rc[ic] as number[], code - ic, 1, target)
    );
  };
  return (tri) => {
    for (let m = 0; m < 3; m++) {
      const mid = codes[tri[m] as number] as Int32Array;
      const x = tri[(m + 1) % 3] as number;
      const y = tri[(m + 2) % 3] as number;
      for (let j = 0; j < mid.length; j++) if (near(mid[j] as number, x) && near(mid[j] as number, y)) return true;
    }
    return false;
  };
}

// Whether moving one phase from `base` (the code with that phase's index taken out) to any of the
// level indices `to` lands on a triplet of vector `target`.
function hits(owner: Int32Array, to: readonly number[], base: number, stride: number, target: number): boolean {
  for (let j = 0; j < to.length; j++) if (owner[base + (to[j] as number) * stride] === target) return true;
  return false;
}

function moveMaps(moves: PhaseMoves): Map<number, number[]>[] {
  return moves.map((list) => {
    const m = new Map<number, number[]>();
    for (const [a, b] of list) m.set(a, [...(m.get(a) ?? []), b]);
    return m;
  });
}

function key(t: LevelTriplet): string {
  return `${t[0]},${t[1]},${t[2]}`;
}
