import type { LegAnalysis } from './analyseLeg.js';
import { legLevels } from '../netlist/expandElements.js';
import { PHASES } from '../netlist/faults.js';
import { explainRestrictions, levelName } from './restrictions.js';

/** Why a fault set limits the leg: one phrase, and every finding behind it. */
export interface FaultReason {
  /** One phrase for a table cell: the lost levels, else the first restriction, else "redundancy only". */
  readonly reason: string;
  /** Shoot-through patterns, lost levels per current sign, and every restriction, in words. */
  readonly details: readonly string[];
}

const SIGN: Readonly<Record<'+' | '-', string>> = { '+': 'i > 0', '-': 'i < 0' };

/**
 * Explains in words what a fault set takes from the leg: patterns that now shoot through, levels a
 * phase can no longer give for a current sign (against the healthy leg), and the restrictions the
 * rating and commutation checks impose (`explainRestrictions`).
 *
 * @param analysis - the analysed (faulted) leg
 * @param mMax - the limit it leaves (0 adds "cannot run")
 * @returns the phrase and the details
 * @example
 * ```ts
 * faultReason(analyseLeg({ topology: 'npc', faults: ['a.innerUpper'] }), 0.5).reason; // 'phase a loses P, O for i > 0'
 * ```
 */
export function faultReason(analysis: LegAnalysis, mMax: number): FaultReason {
  const dc = legLevels(analysis.leg);
  const shoot: string[] = [];
  const lost: string[] = [];
  const faulted = new Set(analysis.faults.map((f) => f.phase));
  for (const ph of PHASES) {
    if (!faulted.has(ph)) continue;
    const table = analysis.phases[ph];
    table.patterns.forEach((p, k) => {
      if (p.status === 'forbidden' && analysis.healthy.patterns[k]?.status === 'allowed')
        shoot.push(`phase ${ph}: pattern ${p.name} shoots through (${p.shootThrough.from}→${p.shootThrough.to})`);
    });
    const parts: string[] = [];
    for (const s of ['+', '-'] as const) {
      const have = new Set(table.levels[s]);
      const gone = analysis.healthy.levels[s].filter((l) => !have.has(l));
      if (gone.length > 0) parts.push(`${gone.map((l) => levelName(l, dc)).join(', ')} for ${SIGN[s]}`);
    }
    if (parts.length > 0) lost.push(`phase ${ph} loses ${parts.join('; ')}`);
  }
  const restrictions = explainRestrictions(analysis);
  const main = lost[0] ?? shoot[0] ?? restrictions[0] ?? 'no level or level change lost (redundancy only)';
  const more = lost.length + shoot.length + restrictions.length > 1 ? ' (and more)' : '';
  return { reason: `${mMax <= 1e-9 ? 'cannot run: ' : ''}${main}${more}`, details: [...shoot, ...lost, ...restrictions] };
}
