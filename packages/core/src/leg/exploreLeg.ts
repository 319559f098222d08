import type { LegAnalysis } from './analyseLeg.js';
import type { CurrentSign } from './conduction.js';
import { gatedDeviceIds } from '../netlist/expandElements.js';
import { PHASES, type Phase } from '../netlist/faults.js';
import { usableLevel, type GateSetSolver } from './gateSetSolver.js';

/** Legs with more switches than this are not enumerated (2^n combinations). */
export const EXPLORE_MAX_SWITCHES = 16;

/** A gate combination that is usable for at least one current sign. */
export interface ExploredCombination {
  readonly gates: readonly string[];
  /** Level per sign, `null` where interrupted or overstressing a device (not usable for that sign). */
  readonly '+': number | null;
  readonly '-': number | null;
}

/** Exploration result of one phase. */
export interface PhaseExploration {
  readonly combinations: number;
  readonly shootThrough: number;
  /** Sign cases dropped because no static voltage distribution keeps every device within its rating. */
  readonly overstressed: number;
  /** Levels the usable combinations give that the named patterns do not. */
  readonly extraLevels: Readonly<Record<CurrentSign | '?', readonly number[]>>;
  /** Usable combinations that give one of the extra levels. */
  readonly extraCombinations: readonly ExploredCombination[];
}

/** Result of {@link exploreLeg}. */
export type LegExploration =
  { readonly ok: true; readonly phases: Readonly<Record<Phase, PhaseExploration>> } | { readonly ok: false; readonly reason: string };

/**
 * Enumerates every gate combination of the leg and reports which extra levels the hardware can
 * still give under the faults, beyond the named patterns.
 *
 * A combination is dropped when it shoots through, and dropped for a current sign when it is not
 * usable for it: the current is interrupted, or (with ratings applied) the static voltage check
 * finds no distribution of node potentials within the device ratings — the same check that the
 * leg table applies to the named patterns, so there is one notion of "this state overstresses a
 * device". Unrated devices are not checked.
 *
 * @param analysis - from `analyseLeg`
 * @returns per phase the counts and extra levels, or `{ ok: false }` for too many switches
 * @example
 * ```ts
 * exploreLeg(analyseLeg({ topology: 'anpc', faults: ['a.clampUpper'] }));
 * ```
 */
export function exploreLeg(analysis: LegAnalysis): LegExploration {
  const switches = gatedDeviceIds(analysis.leg);
  if (switches.length > EXPLORE_MAX_SWITCHES) {
    return { ok: false, reason: `leg has ${switches.length} switches; exploration enumerates 2^n combinations and stops at ${EXPLORE_MAX_SWITCHES}` };
  }
  const phases = {} as Record<Phase, PhaseExploration>;
  for (const ph of PHASES) {
    const t = analysis.phases[ph];
    phases[ph] = explorePhase(switches, t.solve, t.levels);
  }
  return { ok: true, phases };
}

function explorePhase(switches: readonly string[], solve: GateSetSolver, named: Record<CurrentSign | '?', readonly number[]>): PhaseExploration {
  let shootThrough = 0;
  let overstressed = 0;
  const usable: ExploredCombination[] = [];
  for (let mask = 0; mask < 1 << switches.length; mask++) {
    const gates = switches.filter((_, i) => mask & (1 << i));
    const o = solve(gates);
    if (o.status === 'forbidden') {
      shootThrough++;
      continue;
    }
    const level = (s: CurrentSign): number | null => {
      if (o.unsafe[s]) overstressed++;
      return usableLevel(o, s);
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
  const extraCombinations = usable.filter(
    (c) =>
      (c['+'] !== null && extraLevels['+'].includes(c['+'])) ||
      (c['-'] !== null && extraLevels['-'].includes(c['-'])) ||
      (c['+'] !== null && c['+'] === c['-'] && extraLevels['?'].includes(c['+'])),
  );
  return { combinations: 1 << switches.length, shootThrough, overstressed, extraLevels, extraCombinations };
}
