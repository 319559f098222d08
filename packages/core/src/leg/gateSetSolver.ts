import { compiledLeg } from './compiledLeg.js';
import { conductionEdges, outputForSign, type CurrentSign, type ShootThrough, type SignOutcome } from './conduction.js';
import { expandElements, gatedDeviceIds } from '../netlist/expandElements.js';
import type { PhaseFaults } from '../netlist/faults.js';
import type { LegNetlist } from '../netlist/netlist.js';
import { ratingChecker } from './ratingCheck.js';

/** What one gate set does in a (possibly faulted) phase leg, per current sign. */
export type GateSetOutcome =
  | {
      readonly status: 'allowed';
      /** Per sign: level (`null` when interrupted or not within ratings), DC nodes, conducting path. */
      readonly bySign: Readonly<Record<CurrentSign, SignOutcome>>;
      /** Per sign, why an otherwise defined level is not usable (the static voltage check). */
      readonly unsafe: Readonly<Partial<Record<CurrentSign, string>>>;
    }
  | { readonly status: 'forbidden'; readonly shootThrough: ShootThrough };

/** A memoised solver of gate sets for one phase: faults and the rating rule fixed. */
export interface GateSetSolver {
  /** The outcome of a gate set (any order, unknown names ignored). */
  (gates: readonly string[]): GateSetOutcome;
  /**
   * Each gated device's value in a numeric gate-set key (the key of a set is the sum of its
   * members' values), or `null` past 52 gated devices, where keys would not be exact.
   */
  readonly keyValue: ReadonlyMap<string, number> | null;
  /**
   * The outcome of the gate set with this numeric key; `gates` is called only when that set has not
   * been solved yet, so that a search over many subsets builds no array for a set it revisits.
   *
   * @param key - sum of the members' {@link GateSetSolver.keyValue}
   * @param gates - builds the member list
   * @returns the outcome
   */
  byKey(key: number, gates: () => readonly string[]): GateSetOutcome;
  /**
   * Whether the gate set with this numeric key has been solved already (a search may try those
   * first: the answer is the same, the work less).
   *
   * @param key - sum of the members' {@link GateSetSolver.keyValue}
   * @returns true when cached
   */
  solved(key: number): boolean;
}

const NONE: readonly string[] = Object.freeze([]);
const NO_PATH: SignOutcome = Object.freeze({ level: null, dcNodes: NONE, path: NONE });
const NO_REASONS: Readonly<Partial<Record<CurrentSign, string>>> = Object.freeze({});

/** Options of {@link gateSetSolver}. */
export interface GateSetSolverOptions {
  /** Apply the static voltage check. */
  readonly ratings: boolean;
  /** Also find DC nodes, conducting paths and the overstressed device (slower). Default false. */
  readonly paths?: boolean;
}

/**
 * Makes a solver that tells, for any gate set of a phase leg, whether it shoots through and, per
 * current sign, which level it gives and whether that state keeps every device within its rating.
 * A gate set is **usable** for a sign when it is allowed and its level for
 * that sign is not `null`.
 *
 * @param leg - the leg netlist
 * @param faults - element id → fault mode for this phase
 * @param options - `ratings`: apply the static voltage check (false gives the convex-hull bound's
 *   level tables, unsafe); `paths` (default false): also find the DC nodes and conducting elements of each sign, and name the device an
 *   unsafe state overstresses (slower); without, `dcNodes` and `path` are empty and an unsafe state's
 *   reason is the plain `not within ratings`: only usability is solved, as the commutation search needs
 * @returns a solver; results are cached by gate set, so the solver is cheap to call again
 * @example
 * ```ts
 * const solve = gateSetSolver(builtinLeg('npc'), new Map([['innerUpper', 'open']]), { ratings: true });
 * solve(['outerUpper', 'innerUpper']); // '+' unusable: innerUpper.diode blocks 2 > rating 1
 * ```
 */
export function gateSetSolver(leg: LegNetlist, faults: PhaseFaults, options: GateSetSolverOptions): GateSetSolver {
  const { ratings, paths = false } = options;
  const elements = expandElements(leg);
  const check = ratingChecker(leg, elements, faults);
  // Without a rating anywhere the static check cannot fail once the conduction rules found no
  // shoot-through: the potentials "highest DC node (or the output) that reaches a node" satisfy
  // every conducting element, every DC node and the output level (a failure would be a forward
  // path from a DC node down to a lower one, which is a shoot-through). So it is skipped.
  const rated = ratings && elements.some((e) => e.rating !== undefined);
  const fast = compiledLeg(leg, elements, faults);
  // gate sets keyed by a bit per switch (a string key past 52 switches, which no leg has)
  const ids = gatedDeviceIds(leg);
  const wide = ids.length > 52;
  const keyValue = wide ? null : new Map(ids.map((g, i) => [g, 2 ** i]));
  // without paths, a sign's outcome is its level alone: one shared object per level
  const levelOnly = new Map<number, SignOutcome>();
  const bare = (level: number | null): SignOutcome => {
    if (level === null) return NO_PATH;
    let o = levelOnly.get(level);
    if (o === undefined) {
      o = Object.freeze({ level, dcNodes: NONE, path: NONE });
      levelOnly.set(level, o);
    }
    return o;
  };
  const solveNew = (gates: readonly string[]): GateSetOutcome => {
    const lv = fast(gates);
    if (lv.shootThrough) return { status: 'forbidden', shootThrough: lv.shootThrough };
    if (!paths && !rated) return { status: 'allowed', bySign: { '+': bare(lv.plus), '-': bare(lv.minus) }, unsafe: NO_REASONS };
    const on = new Set(gates);
    const edges = paths ? conductionEdges(elements, on, faults) : [];
    const unsafe: Partial<Record<CurrentSign, string>> = {};
    const sign = (s: CurrentSign): SignOutcome => {
      const level = s === '+' ? lv.plus : lv.minus;
      const o = paths ? outputForSign(leg, edges, s) : bare(level);
      if (o.level === null || !rated) return o;
      const c = check(on, o.level, paths);
      if (c.ok) return o;
      unsafe[s] = c.reason;
      return NO_PATH;
    };
    return { status: 'allowed', bySign: { '+': sign('+'), '-': sign('-') }, unsafe };
  };
  return memoSolver(keyValue, solveNew);
}

/**
 * A {@link GateSetSolver} around a plain "solve this gate set" function: results cached by the
 * numeric gate-set key (by the sorted names where `keyValue` is `null`).
 *
 * @param keyValue - each gated device's key value, or `null` for string keys
 * @param solveNew - solves a gate set not seen before
 * @returns the memoised solver
 * @example
 * ```ts
 * memoSolver(solve.keyValue, (gates) => solve(gates));
 * ```
 */
export function memoSolver(keyValue: ReadonlyMap<string, number> | null, solveNew: (gates: readonly string[]) => GateSetOutcome): GateSetSolver {
  const cache = new Map<number | string, GateSetOutcome>();
  const byKey = (key: number | string, gates: () => readonly string[]): GateSetOutcome => {
    let o = cache.get(key);
    if (o === undefined) {
      o = solveNew(gates());
      cache.set(key, o);
    }
    return o;
  };
  const solve = (gates: readonly string[]): GateSetOutcome => {
    if (keyValue === null) return byKey([...gates].sort().join('\u0000'), () => gates);
    let key = 0;
    for (const g of gates) key += keyValue.get(g) ?? 0;
    return byKey(key, () => gates);
  };
  return Object.assign(solve, { keyValue, byKey: (key: number, gates: () => readonly string[]) => byKey(key, gates), solved: (key: number) => cache.has(key) });
}

/**
 * Level a gate-set outcome gives for a sign, `null` when not usable for it.
 *
 * @param o - a solved gate set
 * @param sign - current sign
 * @returns the level or `null`
 * @example
 * ```ts
 * usableLevel(solve(['upper']), '+'); // 1 on a two-level leg
 * ```
 */
export function usableLevel(o: GateSetOutcome, sign: CurrentSign): number | null {
  return o.status === 'allowed' ? o.bySign[sign].level : null;
}
