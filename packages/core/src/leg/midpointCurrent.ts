import type { LevelTriplet } from '../geometry/clarke.js';
import type { PhasePolarity } from './legTable.js';

/** Sign of the current into the DC midpoint node under a realisation: +1, −1, 0, or null (unknown). */
export type MidpointSign = 1 | -1 | 0 | null;

/**
 * Which phase currents flow through the DC midpoint for a level triplet.
 *
 * A phase at the midpoint potential (0) exchanges its current with the midpoint; the current into
 * the midpoint node is then `i_mid = −Σ c_k·i_k`, with `i_k` positive out of
 * the leg into the load.
 *
 * @param levels - phase levels
 * @param hasMidpoint - whether the leg has a DC node at potential 0
 * @returns 0/1 coefficient per phase
 * @example
 * ```ts
 * midpointCoefficients([1, 0, 0], true); // [0, 1, 1]
 * ```
 */
export function midpointCoefficients(levels: LevelTriplet, hasMidpoint: boolean): [0 | 1, 0 | 1, 0 | 1] {
  return levels.map((l) => (hasMidpoint && l === 0 ? 1 : 0)) as [0 | 1, 0 | 1, 0 | 1];
}

/**
 * Sign of the current into the midpoint node for a polarity string, `i_mid = −Σ c_k·i_k`, using
 * i_a + i_b + i_c = 0.
 *
 * One phase at the midpoint: minus its own sign. Two: the sign of the third, or, where the third
 * reads `?`, minus the common sign of the two when they share one. None or all three: 0. Otherwise
 * the sign is unknown (`null`).
 *
 * @param c - midpoint coefficients
 * @param polarity - per-phase polarity
 * @returns +1 (current into the midpoint node), −1, 0 or null
 * @example
 * ```ts
 * midpointSign([0, 1, 1], ['+', '-', '-']); // +1: −(i_b + i_c) = i_a > 0
 * ```
 */
export function midpointSign(c: readonly (0 | 1)[], polarity: readonly PhasePolarity[]): MidpointSign {
  const s = drawnSign(c, polarity);
  return s === null || s === 0 ? s : (-s as 1 | -1);
}

// The sign of Σ c_k·i_k, the current the phases at the midpoint draw out of it.
function drawnSign(c: readonly (0 | 1)[], polarity: readonly PhasePolarity[]): MidpointSign {
  const n = c.filter((x) => x === 1).length;
  if (n === 0 || n === 3) return 0;
  const sign = (p: PhasePolarity | undefined) => (p === '+' ? 1 : p === '-' ? -1 : 0);
  if (n === 1) {
    const s = sign(polarity[c.indexOf(1)]);
    return s === 0 ? null : (s as 1 | -1);
  }
  // two phases at the midpoint: i_x + i_y = −i_z. Either the third phase's sign is known, or the
  // two share one known sign; a `?` is then resolved by the three currents summing to zero.
  const third = sign(polarity[c.indexOf(0)]);
  if (third !== 0) return -third as 1 | -1;
  const [x, y] = [0, 1, 2].filter((k) => c[k] === 1).map((k) => sign(polarity[k]));
  return x !== 0 && x === y ? (x as 1 | -1) : null;
}
