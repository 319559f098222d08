import { patternLevel } from '../leg/commutation.js';
import { phaseMoves } from '../vectors/diagramAtlas.js';
import type { LegTable, PatternResult, PhasePolarity } from '../leg/legTable.js';
import type { LimitRules } from '../leg/rules.js';

/** The three polarity characters, in the order the runtime and the C header index them. */
export const POLARITY_CHARS: readonly PhasePolarity[] = ['+', '-', '?'];

/**
 * What one phase may do in one step of a switching sequence, per polarity character, as plain data
 * (pattern indices are positions in the leg's named patterns).
 */
export interface PhaseSteps {
  /** Level each named pattern gives for the character (`null`: not usable for it). */
  readonly levels: Readonly<Record<PhasePolarity, readonly (number | null)[]>>;
  /**
   * Directed pattern changes `[i, j]` the phase may make in one step for the character, sorted:
   * both patterns usable, the change commutates safely, and a level change is
   * one of the phase's moves under the rules. Under `levelSteps: any` every change between usable
   * patterns is listed (no sequence rule).
   */
  readonly steps: Readonly<Record<PhasePolarity, readonly (readonly [number, number])[]>>;
  /**
   * Directed pattern changes `[i, j]` the phase may make at the moment its polarity character
   * becomes this one (a period boundary where the measured sign changes or turns unknown): the
   * change commutates safely for the new character (for `?`, for both signs), pattern j is usable
   * for it, and under `levelSteps: adjacent` every level pattern i may give (for either sign) is j's
   * or a neighbouring one. Pattern i itself need not be usable for the new character (it was
   * chosen for the old one).
   */
  readonly entries: Readonly<Record<PhasePolarity, readonly (readonly [number, number])[]>>;
  /**
   * Preference of each pattern for the character, 0 best: the pattern the healthy leg uses for its
   * level first, then the fewest gated devices, then netlist order (as `patternCandidates`).
   */
  readonly preference: Readonly<Record<PhasePolarity, readonly number[]>>;
}

/**
 * The step data of one phase under the rules.
 *
 * @param table - the phase's (faulted) leg table
 * @param healthy - the healthy leg table (same patterns)
 * @param rules - the rules (the level-step rule decides which level changes are moves)
 * @param dcLevels - the leg's DC potentials, ascending
 * @returns levels, allowed steps and preference per polarity character
 * @example
 * ```ts
 * patternSteps(atlas.analysis.phases.a, atlas.analysis.healthy, atlas.analysis.rules, [-1, 0, 1]).steps['+'];
 * ```
 */
export function patternSteps(table: LegTable, healthy: LegTable, rules: LimitRules, dcLevels: readonly number[]): PhaseSteps {
  const gates = table.patterns.map((p) => p.gates);
  const moves = rules.levelSteps === 'any' ? null : phaseMoves(table, rules, dcLevels);
  const healthyLevel = gates.map((g) => patternLevel(healthy.solve, g, '?'));
  const levels = {} as Record<PhasePolarity, (number | null)[]>;
  const steps = {} as Record<PhasePolarity, (readonly [number, number])[]>;
  const entries = {} as Record<PhasePolarity, (readonly [number, number])[]>;
  const near = (a: number, b: number) => Math.abs(dcLevels.indexOf(a) - dcLevels.indexOf(b)) <= 1;
  // every level a pattern may give, whatever the sign
  // the levels the table lists (the same as the solver's for a plain phase; under an ambiguous
  // diagnosis or a bypass the table's, which are what every configuration agrees on)
  const listed = (i: number, c: PhasePolarity): number | null => {
    const p = table.patterns[i] as PatternResult;
    if (p.status !== 'allowed') return null;
    if (c !== '?') return p.bySign[c].level;
    return p.bySign['+'].level !== null && p.bySign['+'].level === p.bySign['-'].level ? p.bySign['+'].level : null;
  };
  const anyLevels = gates.map((_, i) => [listed(i, '+'), listed(i, '-')].filter((l): l is number => l !== null));
  const preference = {} as Record<PhasePolarity, number[]>;
  for (const c of POLARITY_CHARS) {
    const lv = gates.map((_, i) => listed(i, c));
    levels[c] = lv;
    const moveSet = new Set((moves?.[c] ?? []).map(([a, b]) => `${a}>${b}`));
    const list: (readonly [number, number])[] = [];
    lv.forEach((li, i) => {
      if (li === null) return;
      lv.forEach((lj, j) => {
        if (i === j || lj === null) return;
        if (moves !== null) {
          if (li !== lj && !moveSet.has(`${li}>${lj}`)) return;
          if (!table.commutations.patternsCommute(c, i, j)) return;
        }
        list.push([i, j]);
      });
    });
    steps[c] = list;
    const enter: (readonly [number, number])[] = [];
    lv.forEach((lj, j) => {
      if (lj === null) return;
      gates.forEach((_, i) => {
        if (i === j) return;
        if (moves !== null) {
          if (rules.levelSteps === 'adjacent' && !(anyLevels[i] as number[]).every((li) => near(li, lj))) return;
          if (!table.commutations.patternsCommute(c, i, j)) return;
        }
        enter.push([i, j]);
      });
    });
    entries[c] = enter.sort((x, y) => x[0] - y[0] || x[1] - y[1]);
    const order = gates
      .map((g, i) => ({ i, key: [lv[i] !== null && healthyLevel[i] === lv[i] ? 0 : 1, g.length, i] as const }))
      .sort((x, y) => x.key[0] - y.key[0] || x.key[1] - y.key[1] || x.key[2] - y.key[2]);
    const pref = new Array<number>(gates.length).fill(0);
    order.forEach((o, r) => {
      pref[o.i] = r;
    });
    preference[c] = pref;
  }
  return { levels, steps, entries, preference };
}
