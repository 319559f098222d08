import { HexsalvageInputError } from '../shared/errors.js';
import type { CurrentSign } from './conduction.js';
import { usableLevel, type GateSetOutcome, type GateSetSolver } from './gateSetSolver.js';
import type { PhasePolarity } from './conduction.js';

/** A level change a phase may make: [from, to], units of Vdc/2. */
export type LevelMove = readonly [number, number];

/** What a phase can do between its named patterns, per polarity character. */
export interface PhaseCommutations {
  /**
   * Level changes allowed by the contract's sequence rule (both ways commutable), sorted. Searched
   * on first read (a getter): many-level legs have hundreds of level pairs, and a diagram whose
   * Delaunay triangles are admissible needs only {@link PhaseCommutations.adjacentMoves}.
   */
  readonly moves: Readonly<Record<PhasePolarity, readonly LevelMove[]>>;
  /**
   * The level changes between neighbouring levels only (`moves` restricted to them, searched on
   * their own, so cheaply).
   *
   * @param polarity - polarity character
   * @param dcLevels - the leg's levels, ascending
   * @returns the moves between neighbouring levels, sorted
   */
  adjacentMoves(polarity: PhasePolarity, dcLevels: readonly number[]): readonly LevelMove[];
  /**
   * Whether the change from named pattern `i` to named pattern `j` commutates for a polarity
   * character (searched on first use and remembered: the plan needs only `moves`, the switching
   * table asks about the pattern pairs its sequences use).
   */
  readonly patternsCommute: (polarity: PhasePolarity, i: number, j: number) => boolean;
}

/**
 * Whether a change of gate set commutates for a polarity: the switches gated
 * in `from` but not in `to` are turned off one at a time, then those in `to` but not in `from` are
 * turned on one at a time, in some order, such that every intermediate gate set and `to` are usable
 * for the sign. For `?` one order must serve both signs, since the firmware does not know which
 * sign it is switching (the safe reading of "for both signs").
 *
 * The search walks the subsets between `from ∩ to` and `from`, then between `from ∩ to` and `to`,
 * remembering dead ends, so at most 2^|off| + 2^|on| gate sets are solved.
 *
 * @param solve - gate-set solver of the phase
 * @param from - gates of the pattern before
 * @param to - gates of the pattern after
 * @param polarity - current polarity of the phase
 * @returns true when a safe order exists
 * @example
 * ```ts
 * commutates(solve, ['outerUpper', 'innerUpper'], ['innerUpper', 'innerLower'], '+'); // healthy NPC: true
 * ```
 */
export function commutates(solve: GateSetSolver, from: readonly string[], to: readonly string[], polarity: PhasePolarity): boolean {
  const signs: readonly CurrentSign[] = polarity === '?' ? ['+', '-'] : [polarity];
  const ok = (o: GateSetOutcome) => signs.every((s) => usableLevel(o, s) !== null);
  const off = from.filter((g) => !to.includes(g));
  const on = to.filter((g) => !from.includes(g));
  if (off.length === 0 && on.length === 0) return true;
  // subsets are named by bit masks: 31 bits hold them exactly (netlists allow 24, NETLIST_LIMITS)
  if (off.length > 30 || on.length > 30)
    throw new HexsalvageInputError(
      'netlist',
      'leg',
      'patterns',
      'a change of at most 30 switches each way between two gate sets',
      Math.max(off.length, on.length),
    );
  const common = from.filter((g) => to.includes(g));
  // Intermediate sets are named by a numeric key (the sum of their gates' key values) so that a set
  // already solved costs one look-up and no array; the member list is built only for a new set.
  const value = solve.keyValue;
  const sumOf = (gates: readonly string[]) => gates.reduce((k, g) => k + (value?.get(g) ?? 0), 0);
  const commonKey = sumOf(common);
  const onKey = on.map((g) => value?.get(g) ?? 0);
  const offKey = off.map((g) => value?.get(g) ?? 0);
  const usableUp = (mask: number) => {
    const build = () => [...common, ...on.filter((_, k) => mask & (1 << k))];
    return value === null ? ok(solve(build())) : ok(solve.byKey(upKey(mask), build));
  };
  const usableDown = (mask: number) => {
    const build = () => [...common, ...off.filter((_, k) => !(mask & (1 << k)))];
    return value === null ? ok(solve(build())) : ok(solve.byKey(downKey(mask), build));
  };
  const upKey = (mask: number) => {
    let key = commonKey;
    for (let k = 0; k < on.length; k++) if (mask & (1 << k)) key += onKey[k] as number;
    return key;
  };
  const downKey = (mask: number) => {
    let key = commonKey;
    for (let k = 0; k < off.length; k++) if (!(mask & (1 << k))) key += offKey[k] as number;
    return key;
  };
  // The next switch actions are tried in two passes: first those leading to a gate set already
  // solved (another pair's search went that way), then the rest. Any order finds a safe sequence
  // when there is one, since dead ends are remembered and every branch is tried; this one solves
  // fewer new gate sets (on a many-level leg most pairs then walk the same intermediate states).
  const cachedFirst = value !== null;
  let upDead: Set<number> | null = null;
  // `mask`: which of `on` are already on; every set reached is usable
  const up = (mask: number): boolean => {
    if (mask === (1 << on.length) - 1) return true;
    if (upDead?.has(mask)) return false;
    for (let pass = cachedFirst ? 0 : 1; pass < 2; pass++) {
      for (let i = 0; i < on.length; i++) {
        if (mask & (1 << i)) continue;
        const next = mask | (1 << i);
        if (cachedFirst && solve.solved(upKey(next)) !== (pass === 0)) continue;
        if (usableUp(next) && up(next)) return true;
      }
    }
    (upDead ??= new Set()).add(mask);
    return false;
  };
  let downDead: Set<number> | null = null;
  // `mask`: which of `off` are already off
  const down = (mask: number): boolean => {
    if (mask === (1 << off.length) - 1) return up(0);
    if (downDead?.has(mask)) return false;
    for (let pass = cachedFirst ? 0 : 1; pass < 2; pass++) {
      for (let i = 0; i < off.length; i++) {
        if (mask & (1 << i)) continue;
        const next = mask | (1 << i);
        if (cachedFirst && solve.solved(downKey(next)) !== (pass === 0)) continue;
        if (usableDown(next) && down(next)) return true;
      }
    }
    (downDead ??= new Set()).add(mask);
    return false;
  };
  return down(0);
}

/**
 * The level each named pattern gives for a polarity character: for `+`/`-` its usable level for
 * that sign, for `?` the level it gives for both signs alike (else `null`).
 *
 * @param solve - gate-set solver of the phase
 * @param gates - the pattern's gates
 * @param polarity - polarity character
 * @returns the level, or `null` when the pattern cannot serve that polarity
 * @example
 * ```ts
 * patternLevel(solve, ['upper'], '?'); // 1 on a healthy two-level leg
 * ```
 */
export function patternLevel(solve: GateSetSolver, gates: readonly string[], polarity: PhasePolarity): number | null {
  const o = solve(gates);
  if (polarity !== '?') return usableLevel(o, polarity);
  const p = usableLevel(o, '+');
  return p !== null && p === usableLevel(o, '-') ? p : null;
}

/**
 * Which level changes a phase may make, per polarity character: l1 → l2 is
 * allowed when some pattern giving l1 commutates to some pattern giving l2, and some pattern giving
 * l2 commutates back to some pattern giving l1.
 *
 * @param solve - gate-set solver of the phase (the level each pattern gives)
 * @param patterns - the named patterns' gate lists, in netlist order; `null` for a pattern the phase
 *   never uses (it gives no level and takes part in no change)
 * @param step - the solver that decides whether an intermediate state of a change is usable
 *   (default `solve`; under an ambiguous diagnosis: usable in every configuration, whatever level)
 * @returns the moves and the commutating pattern pairs per polarity character
 * @example
 * ```ts
 * phaseCommutations(solve, Object.values(builtinLeg('npc').patterns)).moves['+']; // [[-1, 0], [0, -1], [0, 1], [1, 0]]
 * ```
 */
export function phaseCommutations(solve: GateSetSolver, patterns: readonly (readonly string[] | null)[], step: GateSetSolver = solve): PhaseCommutations {
  const known = new Map<string, boolean>();
  const patternsCommute = (pol: PhasePolarity, i: number, j: number): boolean => {
    const key = `${pol}${i}>${j}`;
    let r = known.get(key);
    if (r === undefined) {
      const a = patterns[i];
      const b = patterns[j];
      r = a !== null && a !== undefined && b !== null && b !== undefined && (i === j || commutates(step, a, b, pol));
      known.set(key, r);
    }
    return r;
  };
  const levelOf = (pol: PhasePolarity) => patterns.map((g) => (g === null ? null : patternLevel(solve, g, pol)));
  const levelMoves = (pol: PhasePolarity, level: readonly (number | null)[], wanted: (l1: number, l2: number) => boolean): LevelMove[] => {
    // one commutating pattern pair per level change is enough: pairs are searched until one is found
    const forward = new Set<string>();
    level.forEach((li, i) => {
      if (li === null || li === undefined) return;
      level.forEach((lj, j) => {
        if (i === j || lj === null || lj === undefined || li === lj || !wanted(li, lj)) return;
        const f = `${li}>${lj}`;
        if (!forward.has(f) && patternsCommute(pol, i, j)) forward.add(f);
      });
    });
    const list: LevelMove[] = [];
    for (const f of forward) {
      const [l1, l2] = f.split('>').map(Number) as [number, number];
      if (forward.has(`${l2}>${l1}`)) list.push([l1, l2]);
    }
    return list.sort((x, y) => x[0] - y[0] || x[1] - y[1]);
  };
  const any = () => true;
  // A sign's moves among the level pairs `wanted` accepts, given the '?' moves among the same pairs:
  // an order that serves both signs serves each, so where the '?' moves already join every wanted
  // pair of the sign's levels both ways (and the levels are the same), they are the sign's moves
  // and need no search of their own (the usual case for a healthy phase)
  const signMoves = (sign: CurrentSign, robust: readonly LevelMove[], wanted: (l1: number, l2: number) => boolean): readonly LevelMove[] => {
    const level = levelOf(sign);
    const levels = [...new Set(level.filter((l): l is number => l !== null))];
    const robustLevels = new Set(levelOf('?').filter((l): l is number => l !== null));
    const same = levels.length === robustLevels.size && levels.every((l) => robustLevels.has(l));
    const pairs = levels.reduce((n, l1) => n + levels.filter((l2) => l1 !== l2 && wanted(l1, l2)).length, 0);
    return same && robust.length === pairs ? robust : levelMoves(sign, level, wanted);
  };
  let all: Record<PhasePolarity, readonly LevelMove[]> | undefined;
  const computeAll = (): Record<PhasePolarity, readonly LevelMove[]> => {
    const robust = levelMoves('?', levelOf('?'), any);
    return { '?': robust, '+': signMoves('+', robust, any), '-': signMoves('-', robust, any) };
  };
  const adjacent = new Map<string, readonly LevelMove[]>();
  const adjacentMoves = (pol: PhasePolarity, dcLevels: readonly number[]): readonly LevelMove[] => {
    const key = `${pol}|${dcLevels.join(',')}`;
    let r = adjacent.get(key);
    if (!r) {
      const near = (l1: number, l2: number) => Math.abs(dcLevels.indexOf(l1) - dcLevels.indexOf(l2)) === 1;
      if (all) r = all[pol].filter(([l1, l2]) => near(l1, l2));
      else r = pol === '?' ? levelMoves(pol, levelOf(pol), near) : signMoves(pol, adjacentMoves('?', dcLevels), near);
      adjacent.set(key, r);
    }
    return r;
  };
  return {
    get moves() {
      all ??= computeAll();
      return all;
    },
    adjacentMoves,
    patternsCommute,
  };
}
