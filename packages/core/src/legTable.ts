import { HexsalvageInputError } from './errors.js';
import { parseNetlist } from './parseNetlist.js';
import { phaseCommutations, type PhaseCommutations } from './commutation.js';
import type { CurrentSign, ShootThrough, SignOutcome } from './conduction.js';
import type { PhaseFaults } from './faults.js';
import { gateSetSolver, type GateSetSolver } from './gateSetSolver.js';
import type { LegNetlist } from './netlist.js';

/** Polarity of one phase as used in level sets: a measured sign, or `?` (unknown: robust). */
export type PhasePolarity = CurrentSign | '?';

/** What one named gate pattern does in a (possibly faulted) leg. */
export type PatternResult =
  | {
      readonly name: string;
      readonly gates: readonly string[];
      readonly status: 'allowed';
      /** Outcome for each current sign; `level: null` means interrupted or not within ratings. */
      readonly bySign: Readonly<Record<CurrentSign, SignOutcome>>;
      /** Per sign, why the pattern is not used although it gives a level (a device overstressed). */
      readonly unsafe: Readonly<Partial<Record<CurrentSign, string>>>;
    }
  | {
      readonly name: string;
      readonly gates: readonly string[];
      readonly status: 'forbidden';
      /** One-line reason, e.g. `shoot-through P→N via upper, lower`. */
      readonly reason: string;
      readonly shootThrough: ShootThrough;
    };

/** Levels a phase can produce, per polarity, each sorted ascending. */
export type LevelSets = Readonly<Record<PhasePolarity, readonly number[]>>;

/** The per-phase leg table: every pattern × sign, the resulting level sets and level moves. */
export interface LegTable {
  readonly patterns: readonly PatternResult[];
  readonly levels: LevelSets;
  /** Level changes and commutating pattern pairs per polarity character. */
  readonly commutations: PhaseCommutations;
  /** Whether the static voltage check was applied. */
  readonly ratings: boolean;
  /** The phase's gate-set solver (memoised, levels only), for intermediate states and exploration. */
  readonly solve: GateSetSolver;
}

/**
 * Solves every named gate pattern of a leg under the given faults.
 *
 * Level sets follow the contract: for `+`/`-` every level some usable pattern gives for that sign;
 * for `?` every level one pattern gives for both signs (a robust pattern). With `ratings` a pattern
 * whose state would make a device block more than its rating is not usable for that sign
 * (Version 2); its reason is kept in `unsafe`.
 *
 * @param leg - the leg netlist
 * @param faults - element id → fault mode for this phase (empty for a healthy phase)
 * @param ratings - apply the static voltage check (default true)
 * @returns the table of pattern outcomes, the level sets and the level moves
 * @example
 * ```ts
 * legTable(builtinLeg('npc'), new Map([['outerUpper', 'open']])).levels['+']; // [-1, 0]
 * ```
 */
export function legTable(leg: LegNetlist, faults: PhaseFaults, ratings = true): LegTable {
  leg = parseNetlist(leg, 'legTable');
  if (!(faults instanceof Map)) throw new HexsalvageInputError('option', 'legTable', 'faults', 'a Map of element id to fault mode (empty for a healthy phase)', faults);
  if (typeof ratings !== 'boolean') throw new HexsalvageInputError('option', 'legTable', 'ratings', 'true or false', ratings);
  const solve = gateSetSolver(leg, faults, ratings);
  const named = gateSetSolver(leg, faults, ratings, true);
  const patterns = Object.entries(leg.patterns).map(([name, gates]): PatternResult => {
    const o = named(gates);
    if (o.status === 'forbidden') {
      const st = o.shootThrough;
      return { name, gates, status: 'forbidden', reason: `shoot-through ${st.from}→${st.to} via ${st.path.join(', ')}`, shootThrough: st };
    }
    return { name, gates, status: 'allowed', bySign: o.bySign, unsafe: o.unsafe };
  });
  const commutations = phaseCommutations(solve, Object.values(leg.patterns));
  return { patterns, levels: levelSets(patterns), commutations, ratings, solve };
}

/**
 * Level sets of a list of pattern results.
 *
 * @param patterns - solved patterns
 * @returns levels per polarity, sorted ascending, without duplicates
 * @example
 * ```ts
 * levelSets(legTable(builtinLeg('two-level'), new Map()).patterns)['?']; // [-1, 1]
 * ```
 */
export function levelSets(patterns: readonly PatternResult[]): LevelSets {
  const plus = new Set<number>();
  const minus = new Set<number>();
  const robust = new Set<number>();
  for (const p of patterns) {
    if (p.status !== 'allowed') continue;
    const lp = p.bySign['+'].level;
    const lm = p.bySign['-'].level;
    if (lp !== null) plus.add(lp);
    if (lm !== null) minus.add(lm);
    if (lp !== null && lp === lm) robust.add(lp);
  }
  const sorted = (s: Set<number>) => [...s].sort((x, y) => x - y);
  return { '+': sorted(plus), '-': sorted(minus), '?': sorted(robust) };
}
