import type { LegAnalysis } from './analyseLeg.js';
import { blockingVoltages } from './blockingVoltages.js';
import { conductionEdges, findShootThrough, outputForSign, type CurrentSign } from './conduction.js';
import { expandElements, gatedDeviceIds } from './expandElements.js';
import { PHASES, type Phase, type PhaseFaults } from './faults.js';
import type { LegNetlist } from './netlist.js';

/** Legs with more switches than this are not enumerated (2^n combinations). */
export const EXPLORE_MAX_SWITCHES = 16;

/** A gate combination that is safe to use for at least one current sign. */
export interface ExploredCombination {
  readonly gates: readonly string[];
  /** Level per sign, `null` where interrupted or unclamped (not usable for that sign). */
  readonly '+': number | null;
  readonly '-': number | null;
}

/** Exploration result of one phase. */
export interface PhaseExploration {
  readonly combinations: number;
  readonly shootThrough: number;
  /** Combinations dropped for a sign because an off device could block more than its budget. */
  readonly unclamped: number;
  /** Levels the usable combinations give that the named patterns do not. */
  readonly extraLevels: Readonly<Record<CurrentSign | '?', readonly number[]>>;
  /** Usable combinations that give one of the extra levels. */
  readonly extraCombinations: readonly ExploredCombination[];
}

/** Result of {@link exploreLeg}. */
export type LegExploration =
  | { readonly ok: true; readonly blockingBudget: Readonly<Record<string, number>>; readonly phases: Readonly<Record<Phase, PhaseExploration>> }
  | { readonly ok: false; readonly reason: string };

/**
 * Enumerates every gate combination of the leg and reports which extra levels the hardware can
 * still give under the faults, beyond the named patterns.
 *
 * A combination is dropped when it shoots through, and dropped for a current sign when the current
 * is interrupted or when it leaves a node unclamped: some off device could then have to block more
 * than its budget. A device's budget is the larger of one DC-link step (the widest gap between
 * adjacent DC potentials) and the most it blocks in the leg's own healthy named patterns — so a
 * T-type leg's outer switches, rated for the full link by design, are not held to one step.
 *
 * @param analysis - from `analyseLeg`
 * @returns per phase the counts and extra levels, or `{ ok: false }` for too many switches
 * @example
 * ```ts
 * exploreLeg(analyseLeg({ topology: 'anpc', faults: ['a.clampUpper'] }));
 * ```
 */
export function exploreLeg(analysis: LegAnalysis): LegExploration {
  const leg = analysis.leg;
  const switches = gatedDeviceIds(leg);
  if (switches.length > EXPLORE_MAX_SWITCHES) {
    return { ok: false, reason: `leg has ${switches.length} switches; exploration enumerates 2^n combinations and stops at ${EXPLORE_MAX_SWITCHES}` };
  }
  const budget = blockingBudget(leg);
  const faultsOf = (ph: Phase): PhaseFaults => new Map(analysis.faults.filter((f) => f.phase === ph).map((f) => [f.element, f.mode]));
  const phases = {} as Record<Phase, PhaseExploration>;
  for (const ph of PHASES) {
    const t = analysis.phases[ph];
    phases[ph] = explorePhase(leg, switches, faultsOf(ph), budget, t.levels);
  }
  return { ok: true, blockingBudget: Object.fromEntries(budget), phases };
}

function explorePhase(leg: LegNetlist, switches: readonly string[], faults: PhaseFaults, budget: Map<string, number>, named: Record<CurrentSign | '?', readonly number[]>): PhaseExploration {
  const elements = expandElements(leg);
  let shootThrough = 0;
  let unclamped = 0;
  const usable: ExploredCombination[] = [];
  for (let mask = 0; mask < 1 << switches.length; mask++) {
    const gates = switches.filter((_, i) => mask & (1 << i));
    const edges = conductionEdges(elements, new Set(gates), faults);
    if (findShootThrough(leg, edges)) {
      shootThrough++;
      continue;
    }
    const level = (s: CurrentSign): number | null => {
      const l = outputForSign(leg, edges, s).level;
      if (l === null) return null;
      const v = blockingVoltages(leg, edges, l);
      const over = [...v].some(([id, x]) => x > (budget.get(id) as number) + 1e-9);
      if (over) unclamped++;
      return over ? null : l;
    };
    const c = { gates, '+': level('+'), '-': level('-') };
    if (c['+'] !== null || c['-'] !== null) usable.push(c);
  }
  const extra = (s: CurrentSign | '?') => {
    const got = new Set<number>();
    for (const c of usable) {
      const l = s === '?' ? (c['+'] === c['-'] ? c['+'] : null) : c[s];
      if (l !== null && !named[s].includes(l)) got.add(l);
    }
    return [...got].sort((x, y) => x - y);
  };
  const extraLevels = { '+': extra('+'), '-': extra('-'), '?': extra('?') };
  const extraCombinations = usable.filter((c) =>
    (c['+'] !== null && extraLevels['+'].includes(c['+'])) || (c['-'] !== null && extraLevels['-'].includes(c['-'])) || (c['+'] !== null && c['+'] === c['-'] && extraLevels['?'].includes(c['+'])));
  return { combinations: 1 << switches.length, shootThrough, unclamped, extraLevels, extraCombinations };
}

/**
 * Per-device blocking budget: max(one DC-link step, most it blocks in the healthy named patterns).
 *
 * @param leg - the leg netlist
 * @returns device id → budget, units of Vdc/2
 * @example
 * ```ts
 * blockingBudget(builtinLeg('tnpc')).get('upper'); // 2 (full link, by design)
 * ```
 */
export function blockingBudget(leg: LegNetlist): Map<string, number> {
  const pots = [...new Set(Object.values(leg.dcNodes))].sort((x, y) => x - y);
  const step = Math.max(...pots.slice(1).map((p, i) => p - (pots[i] as number)));
  const budget = new Map(leg.devices.map((d) => [d.id, step]));
  const elements = expandElements(leg);
  for (const gates of Object.values(leg.patterns)) {
    const edges = conductionEdges(elements, new Set(gates), new Map());
    if (findShootThrough(leg, edges)) continue;
    for (const s of ['+', '-'] as const) {
      const l = outputForSign(leg, edges, s).level;
      if (l === null) continue;
      for (const [id, v] of blockingVoltages(leg, edges, l)) budget.set(id, Math.max(budget.get(id) as number, v));
    }
  }
  return budget;
}
