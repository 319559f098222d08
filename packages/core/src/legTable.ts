import { conductionEdges, findShootThrough, outputForSign, type CurrentSign, type ShootThrough, type SignOutcome } from './conduction.js';
import { expandElements } from './expandElements.js';
import type { PhaseFaults } from './faults.js';
import type { LegNetlist } from './netlist.js';

/** Polarity of one phase as used in level sets: a measured sign, or `?` (unknown: robust). */
export type PhasePolarity = CurrentSign | '?';

/** What one named gate pattern does in a (possibly faulted) leg. */
export type PatternResult =
  | {
      readonly name: string;
      readonly gates: readonly string[];
      readonly status: 'allowed';
      /** Outcome for each current sign; `level: null` means the current is interrupted. */
      readonly bySign: Readonly<Record<CurrentSign, SignOutcome>>;
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

/** The per-phase leg table: every pattern × sign, and the resulting level sets. */
export interface LegTable {
  readonly patterns: readonly PatternResult[];
  readonly levels: LevelSets;
}

/**
 * Solves every named gate pattern of a leg under the given faults.
 *
 * Level sets follow the contract: for `+`/`-` every level some allowed pattern gives for that sign;
 * for `?` every level one pattern gives for both signs (a robust pattern).
 *
 * @param leg - the leg netlist
 * @param faults - element id → fault mode for this phase (empty for a healthy phase)
 * @returns the table of pattern outcomes and the level sets
 * @example
 * ```ts
 * legTable(builtinLeg('npc'), new Map([['outerUpper', 'open']])).levels['+']; // [-1, 0]
 * ```
 */
export function legTable(leg: LegNetlist, faults: PhaseFaults): LegTable {
  const elements = expandElements(leg);
  const patterns = Object.entries(leg.patterns).map(([name, gates]) => solvePattern(leg, elements, name, gates, faults));
  return { patterns, levels: levelSets(patterns) };
}

function solvePattern(leg: LegNetlist, elements: ReturnType<typeof expandElements>, name: string, gates: readonly string[], faults: PhaseFaults): PatternResult {
  const edges = conductionEdges(elements, new Set(gates), faults);
  const st = findShootThrough(leg, edges);
  if (st) {
    return { name, gates, status: 'forbidden', reason: `shoot-through ${st.from}→${st.to} via ${st.path.join(', ')}`, shootThrough: st };
  }
  return { name, gates, status: 'allowed', bySign: { '+': outputForSign(leg, edges, '+'), '-': outputForSign(leg, edges, '-') } };
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
