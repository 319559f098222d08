import type { LegAnalysis } from './analyseLeg.js';
import { formatFault, PHASES, type Phase } from './faults.js';
import type { LegTable } from './legTable.js';

/** One pattern in the `leg` JSON document. */
export type LegDocumentPattern = { readonly '+': number | null; readonly '-': number | null } | { readonly forbidden: string };

/** The `leg` command's JSON document, exactly as the interface contract fixes it (plus `paths`). */
export interface LegDocument {
  readonly topology: string;
  readonly faults: readonly string[];
  readonly phases: Readonly<Record<Phase, {
    readonly patterns: Readonly<Record<string, LegDocumentPattern>>;
    readonly levels: LegTable['levels'];
    /** Per allowed pattern and sign, the elements that carry the current. */
    readonly paths: Readonly<Record<string, { readonly '+': readonly string[]; readonly '-': readonly string[] }>>;
  }>>;
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
  for (const ph of PHASES) {
    const table = analysis.phases[ph];
    const patterns: Record<string, LegDocumentPattern> = {};
    const paths: Record<string, { '+': readonly string[]; '-': readonly string[] }> = {};
    for (const p of table.patterns) {
      if (p.status === 'forbidden') {
        patterns[p.name] = { forbidden: p.reason };
      } else {
        patterns[p.name] = { '+': p.bySign['+'].level, '-': p.bySign['-'].level };
        paths[p.name] = { '+': p.bySign['+'].path, '-': p.bySign['-'].path };
      }
    }
    phases[ph] = { patterns, levels: table.levels, paths };
  }
  return { topology: analysis.topology, faults: analysis.faults.map(formatFault), phases };
}
