import {
  analyseLeg,
  CAUTIONS,
  describeRules,
  exploreLeg,
  legDocument,
  levelNotation,
  PHASES,
  type LegDocument,
  type LegTable,
  type PatternResult,
  type PhasePolarity,
} from '@hexsalvage/core';
import { faultTexts } from '@hexsalvage/core/internal';
import { HELP_OPTION, JSON_OPTION, LEG_OPTIONS, type Command } from '../command.js';
import { cautionBlock, levelText, textTable } from '../format.js';
import { legInputs } from '../inputs/legInputs.js';
import { exploreText } from './exploreText.js';

/** `hexsalvage leg`: what every gate pattern gives per current sign, per phase. */
export const legCommand: Command = {
  name: 'leg',
  summary: 'levels of every gate pattern for each current sign, per phase, with faults applied',
  usage: 'leg --topology T [--fault F]... [--explore] [--json]',
  options: [
    ...LEG_OPTIONS,
    { name: 'explore', type: 'flag', help: 'also enumerate every gate combination and list the extra levels it offers' },
    JSON_OPTION,
    HELP_OPTION,
  ],
  run: async (args, io) => {
    const { topology, faults, rules } = legInputs(args);
    const analysis = analyseLeg({ topology, faults, ...rules });
    const explore = args.flags.has('explore');
    if (args.flags.has('json')) {
      const doc = legDocument(analysis);
      const extra = explore ? { explore: exploreLeg(analysis) } : {};
      await io.stdout(`${JSON.stringify({ ...doc, ...extra })}\n`);
      return 0;
    }
    const doc = legDocument(analysis);
    const lines: string[] = [
      `Leg: ${analysis.topology}   faults: ${faultTexts(analysis).join(', ') || 'none'}`,
      `Rules: ${describeRules(analysis.rules)}${analysis.unrated.length ? `; unrated (not checked): ${analysis.unrated.join(', ')}` : ''}`,
    ];
    const dc = Object.values(analysis.leg.dcNodes);
    const healthyPhases = PHASES.filter((p) => analysis.phases[p] === analysis.healthy);
    for (const ph of PHASES) {
      if (analysis.phases[ph] === analysis.healthy && ph !== healthyPhases[0]) continue;
      const title = analysis.phases[ph] === analysis.healthy ? `Phase ${healthyPhases.join(', ')} (healthy)` : `Phase ${ph} (faulted)`;
      lines.push('', title, phaseTable(analysis.phases[ph], analysis.healthy, dc), movesText(doc.phases[ph].moves, dc));
    }
    if (explore) lines.push('', exploreText(analysis));
    lines.push(
      '',
      `Levels: ${levelNotation(dc).legend}; "open" = current interrupted, "unsafe" = a device would block more than its rating: the pattern must not be used for that sign.`,
    );
    lines.push(cautionBlock(CAUTIONS));
    await io.stdout(`${lines.join('\n')}\n`);
    return 0;
  },
};

function phaseTable(t: LegTable, healthy: LegTable, dc: readonly number[]): string {
  const lt = (l: number | null) => levelText(l, dc);
  const rows = t.patterns.map((p, i) => {
    const h = healthy.patterns[i] as PatternResult;
    if (p.status === 'forbidden') return [p.name, p.gates.join('+') || '(none)', 'FORBIDDEN', 'FORBIDDEN', p.reason];
    const cell = (s: '+' | '-') => {
      const lv = p.bySign[s].level;
      const was = h.status === 'allowed' ? h.bySign[s].level : null;
      const shown = lv === null && p.unsafe[s] ? 'unsafe' : lt(lv);
      return lv === was ? shown : `${shown} (was ${lt(was)})`;
    };
    const notes = (['+', '-'] as const)
      .filter((s) => p.bySign[s].level === null)
      .map((s) => `not used for i${s === '+' ? '>0' : '<0'}: ${p.unsafe[s] ? `unsafe, ${p.unsafe[s]}` : 'current interrupted'}`);
    return [p.name, p.gates.join('+') || '(none)', cell('+'), cell('-'), notes.join('; ')];
  });
  const sets = (['+', '-', '?'] as PhasePolarity[]).map((s) => {
    const lost = healthy.levels[s].filter((l) => !t.levels[s].includes(l));
    const label = s === '?' ? 'either sign (robust)' : s === '+' ? 'current out (+)' : 'current in (-)';
    return `  ${label.padEnd(22)} ${t.levels[s].map(lt).join(' ') || '(none)'}${lost.length ? `   LOST: ${lost.map(lt).join(' ')}` : ''}`;
  });
  return `${textTable(['pattern', 'gates on', 'i>0 (+)', 'i<0 (-)', 'note'], rows)}\nLevel sets:\n${sets.join('\n')}`;
}

function movesText(moves: LegDocument['phases']['a']['moves'], dc: readonly number[]): string {
  const one = (s: PhasePolarity) => {
    const pairs = moves[s].filter(([a, b]) => a < b).map(([a, b]) => `${levelText(a, dc)}<->${levelText(b, dc)}`);
    return pairs.join(' ') || '(none: the phase cannot change level)';
  };
  return `Level changes a sequence may make:\n  current out (+)        ${one('+')}\n  current in (-)         ${one('-')}\n  either sign (robust)   ${one('?')}`;
}
