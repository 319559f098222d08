import type { CurrentSign } from './conduction.js';
import type { LegTable, PatternResult, PhasePolarity } from './legTable.js';

/** The gate pattern chosen to produce one level in one phase. */
export interface PatternChoice {
  readonly pattern: string;
  readonly gates: readonly string[];
  /** DC nodes the phase current is exchanged with (empty for a `?` phase). */
  readonly dcNodes: readonly string[];
}

/**
 * Every gate pattern that gives a level for a phase's current polarity, best first.
 *
 * Candidates give `level` for that sign (for `?`, for both signs). Preference, in order: the
 * pattern whose healthy level (both signs) is the level wanted — it is the one the firmware
 * already uses for that level; then the fewest gated devices; then netlist order.
 *
 * @param table - the phase's (faulted) leg table
 * @param healthy - the healthy leg table (same pattern order)
 * @param level - level wanted
 * @param polarity - the phase's polarity
 * @returns the candidates in preference order (empty when no allowed pattern gives the level)
 * @example
 * ```ts
 * patternCandidates(faultedTable, healthyTable, 0, '+').map((c) => c.pattern); // e.g. ['O-lower', 'O-upper']
 * ```
 */
export function patternCandidates(table: LegTable, healthy: LegTable, level: number, polarity: PhasePolarity): PatternChoice[] {
  const gives = (p: PatternResult, s: CurrentSign) => p.status === 'allowed' && p.bySign[s].level === level;
  const fits = (p: PatternResult) => (polarity === '?' ? gives(p, '+') && gives(p, '-') : gives(p, polarity));
  return table.patterns
    .map((p, i) => ({
      p,
      rank: [gives(healthy.patterns[i] as PatternResult, '+') && gives(healthy.patterns[i] as PatternResult, '-') ? 0 : 1, p.gates.length, i],
    }))
    .filter(({ p }) => fits(p))
    .sort((x, y) => x.rank[0]! - y.rank[0]! || x.rank[1]! - y.rank[1]! || x.rank[2]! - y.rank[2]!)
    .map(({ p }) => ({ pattern: p.name, gates: p.gates, dcNodes: p.status === 'allowed' && polarity !== '?' ? p.bySign[polarity].dcNodes : [] }));
}

/**
 * Picks the preferred gate pattern for a level (the first of {@link patternCandidates}).
 *
 * @param table - the phase's (faulted) leg table
 * @param healthy - the healthy leg table
 * @param level - level wanted
 * @param polarity - the phase's polarity
 * @returns the chosen pattern, or `null` when no allowed pattern gives the level
 * @example
 * ```ts
 * choosePattern(faultedTable, healthyTable, 0, '+')?.pattern;
 * ```
 */
export function choosePattern(table: LegTable, healthy: LegTable, level: number, polarity: PhasePolarity): PatternChoice | null {
  return patternCandidates(table, healthy, level, polarity)[0] ?? null;
}
