import { compiledLeg } from './compiledLeg.js';
import { conductionEdges, outputForSign, type CurrentSign, type ShootThrough, type SignOutcome } from './conduction.js';
import { expandElements, gatedDeviceIds } from './expandElements.js';
import type { PhaseFaults } from './faults.js';
import type { LegNetlist } from './netlist.js';
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
export type GateSetSolver = (gates: readonly string[]) => GateSetOutcome;

const NO_PATH: SignOutcome = { level: null, dcNodes: [], path: [] };

/**
 * Makes a solver that tells, for any gate set of a phase leg, whether it shoots through and, per
 * current sign, which level it gives and whether that state keeps every device within its rating.
 * A gate set is **usable** for a sign (contract, Version 2) when it is allowed and its level for
 * that sign is not `null`.
 *
 * @param leg - the leg netlist
 * @param faults - element id → fault mode for this phase
 * @param ratings - apply the static voltage check (false reproduces the first version)
 * @param paths - also find the DC nodes and conducting elements of each sign, and name the device an
 *   unsafe state overstresses (slower); without, `dcNodes` and `path` are empty and an unsafe state's
 *   reason is the plain `not within ratings`: only usability is solved, as the commutation search needs
 * @returns a solver; results are cached by gate set, so the solver is cheap to call again
 * @example
 * ```ts
 * const solve = gateSetSolver(builtinLeg('npc'), new Map([['innerUpper', 'open']]), true);
 * solve(['outerUpper', 'innerUpper']); // '+' unusable: innerUpper.diode blocks 2 > rating 1
 * ```
 */
export function gateSetSolver(leg: LegNetlist, faults: PhaseFaults, ratings: boolean, paths = false): GateSetSolver {
  const elements = expandElements(leg);
  const check = ratingChecker(leg, elements, faults);
  const fast = compiledLeg(leg, elements, faults);
  // gate sets keyed by a bit per switch (a string key past 52 switches, which no leg has)
  const bit = new Map(gatedDeviceIds(leg).map((g, i) => [g, i]));
  const wide = bit.size > 52;
  const cache = new Map<number | string, GateSetOutcome>();
  return (gates) => {
    let key: number | string = 0;
    if (wide) key = [...gates].sort().join('\u0000');
    else for (const g of gates) key += 2 ** (bit.get(g) as number);
    const known = cache.get(key);
    if (known) return known;
    const on = new Set(gates);
    const lv = fast(gates);
    const edges = paths && !lv.shootThrough ? conductionEdges(elements, on, faults) : [];
    let out: GateSetOutcome;
    if (lv.shootThrough) out = { status: 'forbidden', shootThrough: lv.shootThrough };
    else {
      const unsafe: Partial<Record<CurrentSign, string>> = {};
      const sign = (s: CurrentSign): SignOutcome => {
        const level = s === '+' ? lv.plus : lv.minus;
        const o = paths ? outputForSign(leg, edges, s) : level === null ? NO_PATH : { level, dcNodes: [], path: [] };
        if (o.level === null || !ratings) return o;
        const c = check(on, o.level, paths);
        if (c.ok) return o;
        unsafe[s] = c.reason;
        return NO_PATH;
      };
      out = { status: 'allowed', bySign: { '+': sign('+'), '-': sign('-') }, unsafe };
    }
    cache.set(key, out);
    return out;
  };
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
