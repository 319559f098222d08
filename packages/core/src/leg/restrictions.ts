import type { LegAnalysis } from './analyseLeg.js';
import { legLevels } from '../netlist/expandElements.js';
import { commutates, patternLevel } from './commutation.js';
import type { CurrentSign } from './conduction.js';
import { PHASES } from '../netlist/faults.js';
import { usableLevel, type GateSetSolver } from './gateSetSolver.js';
import type { PhasePolarity } from './legTable.js';
import { reasonInWords } from './ratingCheck.js';

/**
 * A level as a reviewer reads it: `P`, `O`, `N` on a leg whose DC potentials are exactly +1, 0, −1
 * (or `P`, `N` on +1, −1), the signed potential otherwise.
 *
 * @param level - potential, units of Vdc/2
 * @param levels - the leg's DC potentials, ascending
 * @returns e.g. `P` or `+0.5`
 * @example
 * ```ts
 * levelName(-1, [-1, 0, 1]); // 'N'
 * ```
 */
export function levelName(level: number, levels: readonly number[]): string {
  const letters = levels.length === 3 && levels[0] === -1 && levels[1] === 0 && levels[2] === 1;
  const two = levels.length === 2 && levels[0] === -1 && levels[1] === 1;
  if (letters || two) return level === 1 ? 'P' : level === 0 ? 'O' : 'N';
  return level > 0 ? `+${level}` : String(level);
}

const SIGN_WORDS: Record<PhasePolarity, string> = {
  '+': 'while its current is positive',
  '-': 'while its current is negative',
  '?': 'while its current sign is unknown',
};

/**
 * What the safety rules take away from each faulted phase, in words a reviewer understands:
 * patterns left out because a device would block more than its rating, and level changes that no
 * safe commutation can make (with the device an attempt would overstress).
 *
 * @param analysis - from `analyseLeg`
 * @returns one sentence per restriction, phases in order, then signs `+`, `-`
 * @example
 * ```ts
 * explainRestrictions(analyseLeg({ topology: 'npc', faults: ['a.clampUpper'] }));
 * // ['phase a: pattern O is not used while its current is positive: outerUpper would block 2 × Vdc/2 …', …]
 * ```
 */
export function explainRestrictions(analysis: LegAnalysis): string[] {
  const out: string[] = [];
  const dc = legLevels(analysis.leg);
  const faulted = new Set(analysis.faults.map((f) => f.phase));
  const gatesOf = Object.values(analysis.leg.patterns);
  for (const ph of PHASES) {
    if (analysis.bypass?.phase === ph) {
      out.push(`phase ${ph}: bypassed, its gates stay off and its output stays at 0`);
      continue;
    }
    if (!faulted.has(ph)) continue;
    const table = analysis.phases[ph];
    for (const p of table.patterns) {
      if (p.status !== 'allowed') continue;
      for (const s of ['+', '-'] as const) {
        const why = p.unsafe[s];
        if (why) out.push(`phase ${ph}: pattern ${p.name} is not used ${SIGN_WORDS[s]}: ${reasonInWords(why)}`);
      }
    }
    if (!analysis.rules.ratings && analysis.rules.levelSteps === 'any') continue;
    // a solver that names the overstressed device (the table's own one only tells usability)
    let named: GateSetSolver | undefined;
    for (const s of ['+', '-'] as const) {
      const levels = table.levels[s];
      const moves = table.commutations.moves[s];
      for (let i = 0; i < levels.length; i++)
        for (let j = i + 1; j < levels.length; j++) {
          const a = levels[i] as number;
          const b = levels[j] as number;
          if (moves.some(([x, y]) => x === a && y === b)) continue;
          // under `adjacent` a change over more than one step is excluded by the rule itself
          if (analysis.rules.levelSteps === 'adjacent' && Math.abs(dc.indexOf(a) - dc.indexOf(b)) > 1) continue;
          named ??= table.explain;
          const obstacle = firstObstacle(named, gatesOf, s, a, b) ?? firstObstacle(named, gatesOf, s, b, a);
          const change = `${levelName(b, dc)}↔${levelName(a, dc)}`;
          out.push(`phase ${ph}: no safe ${change} change ${SIGN_WORDS[s]}${obstacle ? `: ${obstacle}` : ''}`);
        }
    }
  }
  return out;
}

// Why the change from a pattern giving `from` to one giving `to` cannot be made: the state reached by
// the first switch action of the first pair tried, and what goes wrong there.
function firstObstacle(solve: GateSetSolver, patterns: readonly (readonly string[])[], sign: CurrentSign, from: number, to: number): string | null {
  for (const a of patterns) {
    if (patternLevel(solve, a, sign) !== from) continue;
    for (const b of patterns) {
      if (patternLevel(solve, b, sign) !== to || commutates(solve, a, b, sign)) continue;
      const off = a.filter((g) => !b.includes(g));
      const on = b.filter((g) => !a.includes(g));
      const steps =
        off.length > 0
          ? off.map((g) => ({ act: `turning ${g} off first`, gates: a.filter((x) => x !== g) }))
          : on.map((g) => ({ act: `turning ${g} on first`, gates: [...a, g] }));
      for (const st of steps) {
        const o = solve(st.gates);
        if (o.status === 'forbidden') return `${st.act} shoots through ${o.shootThrough.from}→${o.shootThrough.to}`;
        if (usableLevel(o, sign) !== null) continue;
        const why = o.unsafe[sign];
        return `${st.act}, ${why ? reasonInWords(why) : 'the current would find no path (interrupted)'}`;
      }
    }
  }
  return null;
}
