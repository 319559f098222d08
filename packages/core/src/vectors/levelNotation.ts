import type { LevelTriplet } from '../geometry/clarke.js';

/** How levels and level triplets (vectors) of one leg are written, everywhere. */
export interface LevelNotation {
  /** True when the leg has exactly the levels P, O, N (or P, N) and letters are used. */
  readonly letters: boolean;
  /** One level: `P`, `O`, `N`, or a signed number in units of Vdc/2 (`+0.5`, `0`, `-1`). */
  level(l: number): string;
  /** A vector's triplet, phases a, b, c: `PON` with letters, `+0.5/0/-1` otherwise. */
  triplet(t: readonly number[]): string;
  /** One line saying how to read it. */
  readonly legend: string;
}

/**
 * The one notation for levels and vectors of a leg: letters only where the leg has exactly the
 * levels P = +1, O = 0, N = −1 (or a two-level leg's P and N), since only there they are
 * unambiguous; signed numbers in units of Vdc/2 separated by "/" otherwise (a five-level leg's
 * `+0.5/0/-1`), so that no two levels run together.
 *
 * @param dcLevels - the leg's DC potentials (any order), units of Vdc/2
 * @returns the notation
 * @example
 * ```ts
 * levelNotation([-1, 0, 1]).triplet([0, -1, -1]); // 'ONN'
 * levelNotation([-1, -0.5, 0, 0.5, 1]).triplet([0.5, 0, -1]); // '+0.5/0/-1'
 * ```
 */
export function levelNotation(dcLevels: readonly number[]): LevelNotation {
  const sorted = [...new Set(dcLevels)].sort((x, y) => x - y);
  const letters =
    (sorted.length === 3 && sorted[0] === -1 && sorted[1] === 0 && sorted[2] === 1) || (sorted.length === 2 && sorted[0] === -1 && sorted[1] === 1);
  const number = (l: number) => {
    const s = Number(l.toFixed(4)).toString();
    return l > 0 ? `+${s}` : s === '-0' ? '0' : s;
  };
  const level = letters ? (l: number) => (l === 1 ? 'P' : l === 0 ? 'O' : l === -1 ? 'N' : number(l)) : number;
  return {
    letters,
    level,
    triplet: (t) => (letters ? t.map(level).join('') : t.map(level).join('/')),
    legend: letters
      ? `levels P = +1, O = 0, N = -1 (units of Vdc/2); a vector is written with the levels of phases a, b, c, e.g. ${sorted.length === 2 ? 'PNN' : 'PON'}`
      : 'levels in units of Vdc/2; a vector is written with the levels of phases a, b, c separated by "/", e.g. +0.5/0/-1',
  };
}

/**
 * A vector in the notation of its leg (shorthand for `levelNotation(dcLevels).triplet(t)`).
 *
 * @param t - level triplet
 * @param dcLevels - the leg's DC potentials
 * @returns the written vector
 * @example
 * ```ts
 * vectorName([1, 0, -1], [-1, 0, 1]); // 'PON'
 * ```
 */
export function vectorName(t: LevelTriplet | readonly number[], dcLevels: readonly number[]): string {
  return levelNotation(dcLevels).triplet(t);
}
