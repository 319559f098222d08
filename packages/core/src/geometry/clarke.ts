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
  return [clarkeAlpha(levels[0], levels[1], levels[2]), clarkeBeta(levels[1], levels[2])];
}

/**
 * α of the Clarke transform of three levels (what {@link clarke} returns first), for loops that
 * should not build a point per triplet.
 *
 * @param la - phase a level
 * @param lb - phase b level
 * @param lc - phase c level
 * @returns α
 * @example
 * ```ts
 * clarkeAlpha(1, -1, -1); // 4/3
 * ```
 */
export function clarkeAlpha(la: number, lb: number, lc: number): number {
  return (2 / 3) * (la - (lb + lc) / 2);
}

/**
 * β of the Clarke transform of three levels (what {@link clarke} returns second).
 *
 * @param lb - phase b level
 * @param lc - phase c level
 * @returns β
 * @example
 * ```ts
 * clarkeBeta(1, -1); // 2/√3
 * ```
 */
export function clarkeBeta(lb: number, lc: number): number {
  return (lb - lc) / Math.sqrt(3);
}
