import { faultTexts, type LegAnalysis } from '../leg/analyseLeg.js';
import { legLevels } from '../netlist/expandElements.js';
import { PHASES, type Phase } from '../netlist/faults.js';
import { phaseMoves } from './diagramAtlas.js';
import type { LevelMove } from '../leg/commutation.js';
import type { LegTable, PhasePolarity } from '../leg/legTable.js';
import type { LimitRules } from '../leg/rules.js';

/** One pattern in the `leg` JSON document; `unsafe` gives the reason a level is not used. */
export type LegDocumentPattern =
  { readonly '+': number | null; readonly '-': number | null; readonly unsafe?: Readonly<Partial<Record<'+' | '-', string>>> } | { readonly forbidden: string };

/** The `leg` command's JSON document, exactly as the interface contract fixes it (plus `paths`). */
export interface LegDocument {
  readonly topology: string;
  readonly faults: readonly string[];
  readonly rules: LimitRules;
  /** Devices without a voltage rating (not checked). */
  readonly unrated: readonly string[];
  readonly phases: Readonly<
    Record<
      Phase,
      {
        readonly patterns: Readonly<Record<string, LegDocumentPattern>>;
        readonly levels: LegTable['levels'];
        /** Level changes the phase may make per polarity character, under the rules, sorted. */
        readonly moves: Readonly<Record<PhasePolarity, readonly LevelMove[]>>;
        /** Per allowed pattern and sign, the elements that carry the current. */
        readonly paths: Readonly<Record<string, { readonly '+': readonly string[]; readonly '-': readonly string[] }>>;
      }
    >
  >;
}

/**
 * Converts a leg analysis to the `leg` command's JSON document.
 *
 * @param analysis - from {@link analyseLeg}
 * @returns a plain object ready for `JSON.stringify`
 * @example
 * ```ts
 * legDocument(analyseLeg({ topology: 'two-level' })).phases.a.patterns.P; // { '+': 1, '-': 1 }
 * ```
 */
export function legDocument(analysis: LegAnalysis): LegDocument {
  const phases = {} as Record<Phase, LegDocument['phases'][Phase]>;
  const dc = legLevels(analysis.leg);
  for (const ph of PHASES) {
    const table = analysis.phases[ph];
    const patterns: Record<string, LegDocumentPattern> = {};
    const paths: Record<string, { '+': readonly string[]; '-': readonly string[] }> = {};
    for (const p of table.patterns) {
      if (p.status === 'forbidden') {
        patterns[p.name] = { forbidden: p.reason };
      } else {
        const unsafe = Object.keys(p.unsafe).length > 0 ? { unsafe: p.unsafe } : {};
        patterns[p.name] = { '+': p.bySign['+'].level, '-': p.bySign['-'].level, ...unsafe };
        paths[p.name] = { '+': p.bySign['+'].path, '-': p.bySign['-'].path };
      }
    }
    phases[ph] = { patterns, levels: table.levels, moves: documentedMoves(table, analysis.rules, dc), paths };
  }
  return { topology: analysis.topology, faults: faultTexts(analysis), rules: analysis.rules, unrated: analysis.unrated, phases };
}

// Under `levelSteps: any` every change between two levels of a set is allowed (no sequence rule).
function documentedMoves(table: LegTable, rules: LimitRules, dc: readonly number[]): Record<PhasePolarity, readonly LevelMove[]> {
  if (rules.levelSteps !== 'any') return { ...phaseMoves(table, rules, dc) };
  const all = (s: PhasePolarity) => table.levels[s].flatMap((a) => table.levels[s].filter((b) => b !== a).map((b) => [a, b] as const));
  return { '+': all('+'), '-': all('-'), '?': all('?') };
}
