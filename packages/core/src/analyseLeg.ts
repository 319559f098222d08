import { HexsalvageInputError } from './errors.js';
import { unratedDevices } from './expandElements.js';
import { faultsByPhase, PHASES, type Fault, type Phase } from './faults.js';
import { legTable, type LegTable } from './legTable.js';
import type { LegNetlist } from './netlist.js';
import { resolveTopology } from './resolveTopology.js';
import { resolveRules, type LimitRuleOptions, type LimitRules } from './rules.js';
import { requireObject } from './validate.js';
import { BoundedCache } from './boundedCache.js';

// Leg tables already solved, by rating rule, faults and netlist (see BoundedCache).
const TABLES = new BoundedCache<LegTable>(512);

/** Options of {@link analyseLeg}: the leg, its faults and the rules (`ignoreRatings`, `levelSteps`). */
export interface AnalyseLegOptions extends LimitRuleOptions {
  /** A built-in topology id or a netlist object in the file format. */
  readonly topology: unknown;
  /** Fault strings `PHASE.DEVICE[:MODE]`; default none. */
  readonly faults?: readonly string[];
}

/** The leg of every phase, solved: per-phase tables plus the healthy reference. */
export interface LegAnalysis {
  /** Topology id for built-ins, the netlist's `name` otherwise. */
  readonly topology: string;
  readonly leg: LegNetlist;
  readonly faults: readonly Fault[];
  readonly phases: Readonly<Record<Phase, LegTable>>;
  /** The same leg without faults, for "lost level" comparisons. */
  readonly healthy: LegTable;
  /** Rules applied (ratings, level steps). */
  readonly rules: LimitRules;
  /** Devices without a voltage rating (not checked). */
  readonly unrated: readonly string[];
}

/**
 * Solves the leg of each phase under the given faults.
 *
 * @param options - topology and faults (validated here)
 * @returns per-phase leg tables and the healthy table
 * @throws HexsalvageInputError for an unknown topology, a bad netlist or a bad fault string
 * @example
 * ```ts
 * analyseLeg({ topology: 'npc', faults: ['a.outerUpper'] }).phases.a.levels['+']; // [-1, 0]
 * ```
 */
export function analyseLeg(options: AnalyseLegOptions): LegAnalysis {
  requireObject(options, 'analyseLeg', 'an options object { topology, faults?, ignoreRatings?, levelSteps? }');
  const rules = resolveRules(options);
  const leg = resolveTopology(options.topology);
  const texts = options.faults ?? [];
  if (!Array.isArray(texts)) throw new HexsalvageInputError('option', 'options', 'faults', 'an array of fault strings PHASE.DEVICE[:MODE]', texts);
  const byPhase = faultsByPhase(texts, leg, 'faults');
  // leg tables depend only on the netlist, the phase's faults and the rating rule: build each once
  const legKey = JSON.stringify(leg);
  const tableOf = (faults: ReadonlyMap<string, string>) => {
    const key = `${rules.ratings}|${[...faults].map(([e, m]) => `${e}:${m}`).sort().join(',')}|${legKey}`;
    return TABLES.through(key, () => legTable(leg, faults as never, rules.ratings));
  };
  const healthy = tableOf(new Map());
  const phases = {} as Record<Phase, LegTable>;
  for (const p of PHASES) phases[p] = byPhase[p].size === 0 ? healthy : tableOf(byPhase[p]);
  const faults: Fault[] = PHASES.flatMap((p) => [...byPhase[p]].map(([element, mode]) => ({ phase: p, element, mode })));
  return { topology: typeof options.topology === 'string' ? options.topology : leg.name, leg, faults, phases, healthy, rules, unrated: unratedDevices(leg) };
}
