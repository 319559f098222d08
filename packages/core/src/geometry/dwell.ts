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
 * The inverse is computed by LU decomposition with partial pivoting and forward and back
 * substitution against the identity, written out for 3×3 with the operations in the order of the
 * JAMA algorithm as ml-matrix implements it (`inverse`), so that every bit agrees with that library
 * (a test checks it); the library itself is not loaded at run time, which spares every command its
 * start-up cost, and a many-level diagram its thousands of matrix objects.
 *
 * @param points - vector positions
 * @param tri - a non-degenerate triangle
 * @returns the matrix M, row k giving the dwell time of vertex k
 * @throws Error when the triangle is degenerate (singular system), as the library would
 * @example
 * ```ts
 * dwellMatrix([[0, 0], [1, 0], [0, 1]], [0, 1, 2]); // [[-1, -1, 1], [1, 0, 0], [0, 1, 0]]
 * ```
 */
export function dwellMatrix(points: readonly Point[], tri: Triangle): DwellMatrix {
  const p0 = points[tri[0]] as Point;
  const p1 = points[tri[1]] as Point;
  const p2 = points[tri[2]] as Point;
  // lu[3·i + j], rows α, β, 1
  const lu = [p0[0], p1[0], p2[0], p0[1], p1[1], p2[1], 1, 1, 1];
  const piv = [0, 1, 2];
  const col = [0, 0, 0];
  for (let j = 0; j < 3; j++) {
    for (let i = 0; i < 3; i++) col[i] = lu[3 * i + j] as number;
    for (let i = 0; i < 3; i++) {
      const kmax = Math.min(i, j);
      let s = 0;
      for (let k = 0; k < kmax; k++) s += (lu[3 * i + k] as number) * (col[k] as number);
      col[i] = (col[i] as number) - s;
      lu[3 * i + j] = col[i] as number;
    }
    let p = j;
    for (let i = j + 1; i < 3; i++) if (Math.abs(col[i] as number) > Math.abs(col[p] as number)) p = i;
    if (p !== j) {
      for (let k = 0; k < 3; k++) {
        const t = lu[3 * p + k] as number;
        lu[3 * p + k] = lu[3 * j + k] as number;
        lu[3 * j + k] = t;
      }
      const v = piv[p] as number;
      piv[p] = piv[j] as number;
      piv[j] = v;
    }
    if (lu[3 * j + j] !== 0) for (let i = j + 1; i < 3; i++) lu[3 * i + j] = (lu[3 * i + j] as number) / (lu[3 * j + j] as number);
  }
  if (lu[0] === 0 || lu[4] === 0 || lu[8] === 0) throw new Error('LU matrix is singular');
  // X = rows of the identity in pivot order, then L and U solved in place
  const x = [0, 0, 0, 0, 0, 0, 0, 0, 0];
  for (let i = 0; i < 3; i++) x[3 * i + (piv[i] as number)] = 1;
  for (let k = 0; k < 3; k++) {
    for (let i = k + 1; i < 3; i++) for (let c = 0; c < 3; c++) x[3 * i + c] = (x[3 * i + c] as number) - (x[3 * k + c] as number) * (lu[3 * i + k] as number);
  }
  for (let k = 2; k >= 0; k--) {
    for (let c = 0; c < 3; c++) x[3 * k + c] = (x[3 * k + c] as number) / (lu[3 * k + k] as number);
    for (let i = 0; i < k; i++) for (let c = 0; c < 3; c++) x[3 * i + c] = (x[3 * i + c] as number) - (x[3 * k + c] as number) * (lu[3 * i + k] as number);
  }
  const z = (v: number) => (Object.is(v, -0) ? 0 : v);
  return [
    [z(x[0] as number), z(x[1] as number), z(x[2] as number)],
    [z(x[3] as number), z(x[4] as number), z(x[5] as number)],
    [z(x[6] as number), z(x[7] as number), z(x[8] as number)],
  ];
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
