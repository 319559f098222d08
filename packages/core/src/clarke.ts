/** A point of the α-β plane, in units of Vdc/2. */
export type Point = readonly [alpha: number, beta: number];

/** Phase levels (a, b, c) in units of Vdc/2. */
export type LevelTriplet = readonly [la: number, lb: number, lc: number];

/**
 * Amplitude-invariant Clarke transform of three phase levels.
 *
 * `alpha = (2/3)(la − (lb + lc)/2)`, `beta = (lb − lc)/√3`.
 *
 * @param levels - phase potentials (a, b, c) in units of Vdc/2
 * @returns the space vector `[alpha, beta]` in the same units
 * @example
 * ```ts
 * clarke([1, -1, -1]); // [4/3, 0]
 * ```
 */
export function clarke(levels: LevelTriplet): Point {
  const [la, lb, lc] = levels;
  return [(2 / 3) * (la - (lb + lc) / 2), (lb - lc) / Math.sqrt(3)];
}
