import { exploreLeg, PHASES, type LegAnalysis } from '@hexsalvage/core';
import { levelText } from '../format.js';

/**
 * Readable summary of a gate-combination exploration.
 *
 * @param analysis - solved leg
 * @returns text lines for the terminal
 * @example
 * ```ts
 * exploreText(analyseLeg({ topology: 'anpc', faults: ['a.clampUpper'] }));
 * ```
 */
export function exploreText(analysis: LegAnalysis): string {
  const x = exploreLeg(analysis);
  const dc = Object.values(analysis.leg.dcNodes);
  const lt = (l: number) => levelText(l, dc);
  if (!x.ok) return `Exploration skipped: ${x.reason}`;
  const lines = [
    `Exploration of every gate combination (shoot-through dropped; a sign case dropped where the current is interrupted${analysis.rules.ratings ? ' or a device would block more than its rating' : ''}):`,
  ];
  for (const ph of PHASES) {
    const p = x.phases[ph];
    const extra = (['+', '-', '?'] as const).map((s) => `${s}: ${p.extraLevels[s].map(lt).join(' ') || '-'}`).join('   ');
    lines.push(
      `  phase ${ph}: ${p.combinations} combinations, ${p.shootThrough} shoot-through, ${p.overstressed} sign cases overstressing a device; extra levels ${extra}`,
    );
    for (const c of p.extraCombinations.slice(0, 8)) {
      lines.push(`    gates {${c.gates.join(', ')}}  i>0: ${c['+'] === null ? '-' : lt(c['+'])}  i<0: ${c['-'] === null ? '-' : lt(c['-'])}`);
    }
    if (p.extraCombinations.length > 8) lines.push(`    … ${p.extraCombinations.length - 8} more (use --json)`);
  }
  return lines.join('\n');
}
