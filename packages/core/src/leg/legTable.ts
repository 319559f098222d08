import { HexsalvageInputError } from '../shared/errors.js';
import { parseNetlist } from '../netlist/parseNetlist.js';
import { phaseCommutations, type PhaseCommutations } from './commutation.js';
import type { CurrentSign, PhasePolarity, ShootThrough, SignOutcome } from './conduction.js';
import type { PhaseFaults } from '../netlist/faults.js';
import { gateSetSolver, memoSolver, type GateSetOutcome, type GateSetSolver } from './gateSetSolver.js';
import type { LegNetlist } from '../netlist/netlist.js';

export type { PhasePolarity } from './conduction.js';

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
  /**
   * A solver that also names paths and the device an unsafe state overstresses (for explanations);
   * under an ambiguous diagnosis, the joint one.
   */
  readonly explain: GateSetSolver;
  /**
   * Whether a gate set is usable as a state passed through (a step of a commutation, a way out of a
   * state): under an ambiguous diagnosis usable in every configuration, whatever level each gives.
   */
  readonly step: GateSetSolver;
}

/** One configuration a phase may be in: its faults, and how a reason names it. */
export interface PhaseConfiguration {
  readonly faults: PhaseFaults;
  /** e.g. `a.outerUpper:open` (used in reasons when configurations disagree). */
  readonly label: string;
}

/** Options of {@link jointLegTable}. */
export interface JointLegTableOptions {
  /** Apply the static voltage check. Default true. */
  readonly ratings?: boolean;
  /** Named patterns (by index) this phase never uses, with the reason (e.g. a bypassed phase's own patterns). */
  readonly disabled?: ReadonlyMap<number, string>;
}

/**
 * Solves every named gate pattern of a leg under the given faults.
 *
 * Level sets follow the contract: for `+`/`-` every level some usable pattern gives for that sign;
 * for `?` every level one pattern gives for both signs (a robust pattern). With `ratings` a pattern
 * whose state would make a device block more than its rating is not usable for that sign
 *; its reason is kept in `unsafe`.
 *
 * @param leg - the leg netlist
 * @param faults - element id → fault mode for this phase (empty for a healthy phase)
 * @param options - `ratings`: apply the static voltage check (default true)
 * @returns the table of pattern outcomes, the level sets and the level moves
 * @example
 * ```ts
 * legTable(builtinLeg('npc'), new Map([['outerUpper', 'open']])).levels['+']; // [-1, 0]
 * ```
 */
export function legTable(leg: LegNetlist, faults: PhaseFaults, options: { readonly ratings?: boolean } = {}): LegTable {
  const ratings = options.ratings ?? true;
  leg = parseNetlist(leg, 'legTable');
  if (!(faults instanceof Map))
    throw new HexsalvageInputError('option', 'legTable', 'faults', 'a Map of element id to fault mode (empty for a healthy phase)', faults);
  if (typeof ratings !== 'boolean') throw new HexsalvageInputError('option', 'legTable', 'ratings', 'true or false', ratings);
  const solve = gateSetSolver(leg, faults, { ratings });
  const named = gateSetSolver(leg, faults, { ratings, paths: true });
  const patterns = Object.entries(leg.patterns).map(([name, gates]): PatternResult => {
    const o = named(gates);
    if (o.status === 'forbidden') {
      const st = o.shootThrough;
      return { name, gates, status: 'forbidden', reason: `shoot-through ${st.from}→${st.to} via ${st.path.join(', ')}`, shootThrough: st };
    }
    return { name, gates, status: 'allowed', bySign: o.bySign, unsafe: o.unsafe };
  });
  const commutations = phaseCommutations(solve, Object.values(leg.patterns));
  return { patterns, levels: levelSets(patterns), commutations, ratings, solve, explain: named, step: solve };
}

/**
 * The leg table of a phase that may be in any of several configurations (an ambiguous diagnosis:
 * one of the alternatives has failed), and whose patterns may be partly disabled (a bypassed phase).
 * A pattern keeps a level for a sign only when it is usable and gives that level in every
 * configuration; a pattern that shoots through in any configuration is forbidden; a level change is
 * a move only when one pattern pair and one turn-off/turn-on order are safe in every configuration
 * (intermediate states usable in each, whatever level each gives). With one configuration and
 * nothing disabled this is {@link legTable}.
 *
 * @param leg - the leg netlist
 * @param configurations - the configurations the phase may be in (at least one)
 * @param options - rating rule, disabled patterns
 * @returns the joint table
 * @example
 * ```ts
 * jointLegTable(builtinLeg('npc'), [{ faults: new Map([['outerUpper', 'open']]), label: 'a.outerUpper:open' }, { faults: new Map([['outerUpper.diode', 'open']]), label: 'a.outerUpper.diode:open' }]).levels['+'];
 * ```
 */
export function jointLegTable(leg: LegNetlist, configurations: readonly PhaseConfiguration[], options: JointLegTableOptions = {}): LegTable {
  const ratings = options.ratings ?? true;
  const disabled = options.disabled ?? new Map<number, string>();
  if (configurations.length === 0) throw new HexsalvageInputError('option', 'jointLegTable', 'configurations', 'at least one configuration', configurations);
  const tables = configurations.map((c) => legTable(leg, c.faults, { ratings }));
  // a level by the DC node at that potential (the reader's name for it)
  const nodeOf = (l: number | null) => Object.entries(leg.dcNodes).find(([, v]) => v === l)?.[0] ?? `${l} × Vdc/2`;
  const first = tables[0] as LegTable;
  if (tables.length === 1 && disabled.size === 0) return first;
  const patterns = first.patterns.map((p0, i): PatternResult => {
    const off = disabled.get(i);
    if (off !== undefined)
      return { name: p0.name, gates: p0.gates, status: 'allowed', bySign: { '+': NO_LEVEL, '-': NO_LEVEL }, unsafe: { '+': off, '-': off } };
    const k = tables.findIndex((t) => t.patterns[i]?.status === 'forbidden');
    if (k >= 0) {
      const f = (tables[k] as LegTable).patterns[i] as Extract<PatternResult, { status: 'forbidden' }>;
      return tables.length === 1 ? f : { ...f, reason: `${f.reason} if ${(configurations[k] as PhaseConfiguration).label}` };
    }
    const all = tables.map((t) => t.patterns[i] as Extract<PatternResult, { status: 'allowed' }>);
    const unsafe: Partial<Record<CurrentSign, string>> = {};
    const sign = (s: CurrentSign): SignOutcome => {
      const bad = all.findIndex((q) => q.bySign[s].level === null);
      if (bad >= 0) {
        const q = all[bad] as Extract<PatternResult, { status: 'allowed' }>;
        const why = q.unsafe[s] ?? 'the current finds no path (interrupted)';
        if (q.unsafe[s] !== undefined || tables.length > 1)
          unsafe[s] = tables.length > 1 ? `${why} if ${(configurations[bad] as PhaseConfiguration).label}` : why;
        return NO_LEVEL;
      }
      const l0 = (all[0] as Extract<PatternResult, { status: 'allowed' }>).bySign[s].level;
      const other = all.findIndex((q) => q.bySign[s].level !== l0);
      if (other >= 0) {
        unsafe[s] =
          `gives ${nodeOf(l0)} if ${(configurations[0] as PhaseConfiguration).label} but ${nodeOf((all[other] as Extract<PatternResult, { status: 'allowed' }>).bySign[s].level)} if ${(configurations[other] as PhaseConfiguration).label}`;
        return NO_LEVEL;
      }
      return (all[0] as Extract<PatternResult, { status: 'allowed' }>).bySign[s];
    };
    return { name: p0.name, gates: p0.gates, status: 'allowed', bySign: { '+': sign('+'), '-': sign('-') }, unsafe };
  });
  const solve = jointSolver(
    tables.map((t) => t.solve),
    true,
  );
  const step = jointSolver(
    tables.map((t) => t.solve),
    false,
  );
  const gates = Object.values(leg.patterns).map((g, i) => (disabled.has(i) ? null : g));
  const commutations = phaseCommutations(solve, gates, step);
  return {
    patterns,
    levels: levelSets(patterns),
    commutations,
    ratings,
    solve,
    explain: jointSolver(
      tables.map((t) => t.explain),
      true,
    ),
    step,
  };
}

const NO_LEVEL: SignOutcome = Object.freeze({ level: null, dcNodes: Object.freeze([]) as readonly string[], path: Object.freeze([]) as readonly string[] });

// One solver over several configurations: a gate set shoots through if it does in any; for a sign it
// is usable only if usable in every one, and with `sameLevel` only if they all give one level (the
// level a pattern is listed with); without, intermediate states of a commutation only need to be
// usable in each configuration (the level may differ).
function jointSolver(parts: readonly GateSetSolver[], sameLevel: boolean): GateSetSolver {
  const base = parts[0] as GateSetSolver;
  const combine = (outs: readonly GateSetOutcome[]): GateSetOutcome => {
    const bad = outs.find((o) => o.status === 'forbidden');
    if (bad) return bad;
    const allowed = outs as readonly Extract<GateSetOutcome, { status: 'allowed' }>[];
    const unsafe: Partial<Record<CurrentSign, string>> = {};
    const sign = (s: CurrentSign): SignOutcome => {
      const levels = allowed.map((o) => o.bySign[s].level);
      const k = allowed.findIndex((o) => o.bySign[s].level === null);
      if (k >= 0) {
        const why = (allowed[k] as Extract<GateSetOutcome, { status: 'allowed' }>).unsafe[s];
        if (why) unsafe[s] = why;
        return NO_LEVEL;
      }
      if (sameLevel && levels.some((l) => l !== levels[0])) return NO_LEVEL;
      return (allowed[0] as Extract<GateSetOutcome, { status: 'allowed' }>).bySign[s];
    };
    return { status: 'allowed', bySign: { '+': sign('+'), '-': sign('-') }, unsafe };
  };
  return memoSolver(base.keyValue, (gates) => combine(parts.map((p) => p(gates))));
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
