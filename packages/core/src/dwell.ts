import { inverse, Matrix } from 'ml-matrix';
import type { Point } from './clarke.js';
import type { Triangle } from './triangulate.js';

/** A 3×3 dwell-time matrix M with `[d0 d1 d2]ᵀ = M·[alpha beta 1]ᵀ`, rows per vertex. */
export type DwellMatrix = readonly [readonly [number, number, number], readonly [number, number, number], readonly [number, number, number]];

/**
 * Dwell-time matrix of a triangle: the inverse of `[[α0 α1 α2], [β0 β1 β2], [1 1 1]]`.
 *
 * Volt-second balance (d0·v0 + d1·v1 + d2·v2 = v_ref) and d0 + d1 + d2 = 1 are the three rows of
 * that system; its inverse gives the duty cycles as an affine function of the reference.
 *
 * @param points - vector positions
 * @param tri - a non-degenerate triangle
 * @returns the matrix M, row k giving the dwell time of vertex k
 * @example
 * ```ts
 * dwellMatrix([[0, 0], [1, 0], [0, 1]], [0, 1, 2]); // [[-1, -1, 1], [1, 0, 0], [0, 1, 0]]
 * ```
 */
export function dwellMatrix(points: readonly Point[], tri: Triangle): DwellMatrix {
  const v = tri.map((i) => points[i] as Point);
  const a = new Matrix([
    v.map((p) => p[0]),
    v.map((p) => p[1]),
    [1, 1, 1],
  ]);
  const m = inverse(a).to2DArray();
  return m.map((row) => row.map((x) => (Object.is(x, -0) ? 0 : x))) as unknown as DwellMatrix;
}

/**
 * Applies a dwell-time matrix to a reference vector.
 *
 * @param m - dwell matrix of a triangle
 * @param alpha - reference α
 * @param beta - reference β
 * @returns the duty cycles [d0, d1, d2] of the triangle's vertices (they sum to 1)
 * @example
 * ```ts
 * dwellTimes(m, 0.2, 0.1);
 * ```
 */
export function dwellTimes(m: DwellMatrix, alpha: number, beta: number): [number, number, number] {
  return [0, 1, 2].map((k) => {
    const r = m[k as 0 | 1 | 2];
    return r[0] * alpha + r[1] * beta + r[2];
  }) as [number, number, number];
}
