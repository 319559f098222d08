import { HexsalvageInputError } from '../shared/errors.js';
import { expandElements, unratedDevices } from '../netlist/expandElements.js';
import {
  failureConfigurations,
  faultsByPhase,
  formatFailure,
  formatFault,
  parseFailures,
  PHASES,
  type Failure,
  type Fault,
  type Phase,
  type PhaseFaults,
} from '../netlist/faults.js';
import { jointLegTable, type LegTable } from './legTable.js';
import { parseNetlist } from '../netlist/parseNetlist.js';
import { reasonInWords } from './ratingCheck.js';
import type { LegNetlist } from '../netlist/netlist.js';
import { resolveTopology } from '../netlist/resolveTopology.js';
import { resolveRules, type LimitRuleOptions, type LimitRules } from './rules.js';
import { requireObject } from '../shared/validate.js';
import { BoundedCache } from '../shared/boundedCache.js';

// Leg tables already solved, by rating rule, faults and netlist (see BoundedCache).
const TABLES = new BoundedCache<LegTable>(512);

/** Options of {@link analyseLeg}: the leg, its faults and the rules (`ignoreRatings`, `levelSteps`). */
export interface AnalyseLegOptions extends LimitRuleOptions {
  /** A built-in topology id or a netlist object in the file format. */
  readonly topology: unknown;
  /**
   * Fault strings `PHASE.DEVICE[:MODE]`, each one failure; a failure a diagnosis could not pin down
   * lists its candidates separated by `|` (`a.outerUpper|a.outerUpper.diode`). Default none.
   */
  readonly faults?: readonly string[];
  /**
   * A phase whose output a fitted device ties to the DC node at potential 0, every gate of that phase
   * off (a bypass). Default none. Refused on a leg without a DC node at 0.
   */
  readonly bypass?: Phase;
}

/** The bypass of one phase, as modelled: a tie from the DC node at 0 to the output. */
export interface BypassState {
  readonly phase: Phase;
  /** The DC node at potential 0 the output is tied to. */
  readonly node: string;
  /** The id of the tie in the extended netlist (`bypass`, or a free variant of it). */
  readonly device: string;
  /** The name of the pattern "every gate off, tie closed" in the extended netlist. */
  readonly pattern: string;
  /** `null` when the bypassed state is usable for both current signs; otherwise why not. */
  readonly unavailable: string | null;
}

/** The leg of every phase, solved: per-phase tables plus the healthy reference. */
export interface LegAnalysis {
  /** Topology id for built-ins, the netlist's `name` otherwise. */
  readonly topology: string;
  /** The netlist; with a bypass, extended by the tie and its pattern. */
  readonly leg: LegNetlist;
  /** Every element named by a failure (each alternative of an ambiguous one). */
  readonly faults: readonly Fault[];
  /** The failures as given: each its alternatives (one for a plain fault). */
  readonly failures: readonly Failure[];
  /** Every combination of one alternative per failure: the configurations the plan must hold in. */
  readonly configurations: readonly (readonly Fault[])[];
  /** The faults of each phase in the first configuration (with the bypass tie): what a simulation runs. */
  readonly simulated: Readonly<Record<Phase, PhaseFaults>>;
  readonly bypass: BypassState | null;
  readonly phases: Readonly<Record<Phase, LegTable>>;
  /** The same leg without faults, for "lost level" comparisons. */
  readonly healthy: LegTable;
  /** Rules applied (ratings, level steps). */
  readonly rules: LimitRules;
  /** Devices without a voltage rating (not checked). */
  readonly unrated: readonly string[];
}

/**
 * The failures of an analysis as the CLI writes them (alternatives joined by `|`).
 *
 * @param analysis - from {@link analyseLeg}
 * @returns e.g. `['a.outerUpper:open|a.outerUpper.diode:open']`
 * @example
 * ```ts
 * faultTexts(analyseLeg({ topology: 'npc', faults: ['a.outerUpper'] })); // ['a.outerUpper:open']
 * ```
 */
export function faultTexts(analysis: LegAnalysis): string[] {
  return analysis.failures.map(formatFailure);
}

/**
 * Solves the leg of each phase under the given faults.
 *
 * @param options - topology, faults and bypass (validated here)
 * @returns per-phase leg tables and the healthy table
 * @throws HexsalvageInputError for an unknown topology, a bad netlist, a bad fault string or a
 *   bypass that cannot be fitted
 * @example
 * ```ts
 * analyseLeg({ topology: 'npc', faults: ['a.outerUpper'] }).phases.a.levels['+']; // [-1, 0]
 * ```
 */
export function analyseLeg(options: AnalyseLegOptions): LegAnalysis {
  requireObject(options, 'analyseLeg', 'an options object { topology, faults?, bypass?, ignoreRatings?, levelSteps? }');
  const rules = resolveRules(options);
  const base = resolveTopology(options.topology);
  const texts = options.faults ?? [];
  if (!Array.isArray(texts)) throw new HexsalvageInputError('option', 'options', 'faults', 'an array of fault strings PHASE.DEVICE[:MODE]', texts);
  // plain faults keep their own check (one mode per device); alternatives are parsed apart
  if (!texts.some((t) => typeof t === 'string' && t.includes('|'))) faultsByPhase(texts, base, 'faults');
  const failures = parseFailures(texts, base, 'faults');
  const configurations = failureConfigurations(failures);
  if (configurations.length === 0)
    throw new HexsalvageInputError('fault', 'faults', texts.join(', '), 'one mode per device in at least one combination of the alternatives', texts);
  const bypass = options.bypass === undefined ? null : bypassOf(base, options.bypass);
  const leg = bypass ? withTie(base, bypass) : base;
  // leg tables depend only on the netlist, the phase's configurations, the disabled patterns and the
  // rating rule: build each once
  const legKey = JSON.stringify(leg);
  const patternCount = Object.keys(leg.patterns).length;
  const tie = bypass ? patternCount - 1 : -1;
  const tableOf = (ph: Phase | null, maps: readonly { faults: PhaseFaults; label: string }[]): LegTable => {
    const bypassed = ph !== null && bypass?.phase === ph;
    const withTieState = maps.map((m) => ({
      label: m.label,
      faults: bypass ? new Map([...m.faults, [bypass.device, bypassed ? 'short' : 'open'] as const]) : m.faults,
    }));
    const disabled = new Map<number, string>();
    if (bypass) {
      for (let i = 0; i < patternCount; i++) {
        if (bypassed && i !== tie) disabled.set(i, `phase ${ph} is bypassed: its gates stay off`);
        if (!bypassed && i === tie) disabled.set(i, 'used only by a bypassed phase');
      }
    }
    const key = `${rules.ratings}|${withTieState
      .map((m) =>
        [...m.faults]
          .map(([e, md]) => `${e}:${md}`)
          .sort()
          .join(','),
      )
      .join('/')}|${[...disabled.keys()].join(',')}|${legKey}`;
    return TABLES.through(key, () => jointLegTable(leg, withTieState, { ratings: rules.ratings, disabled }));
  };
  const mapsOf = (ph: Phase) => {
    const seen = new Map<string, { faults: PhaseFaults; label: string }>();
    for (const c of configurations) {
      const mine = c.filter((f) => f.phase === ph);
      const faults = new Map(mine.map((f) => [f.element, f.mode] as const));
      const key = [...faults]
        .map(([e, m]) => `${e}:${m}`)
        .sort()
        .join(',');
      if (!seen.has(key)) seen.set(key, { faults, label: mine.map(formatFault).join(' and ') || `phase ${ph} healthy` });
    }
    return [...seen.values()];
  };
  const healthy = tableOf(null, [{ faults: new Map(), label: 'healthy' }]);
  const phases = {} as Record<Phase, LegTable>;
  const simulated = {} as Record<Phase, PhaseFaults>;
  for (const p of PHASES) {
    const maps = mapsOf(p);
    const plain = maps.length === 1 && (maps[0] as { faults: PhaseFaults }).faults.size === 0 && bypass?.phase !== p;
    phases[p] = plain ? healthy : tableOf(p, maps);
    const first = (maps[0] as { faults: PhaseFaults }).faults;
    simulated[p] = bypass ? new Map([...first, [bypass.device, bypass.phase === p ? 'short' : 'open'] as const]) : first;
  }
  const faults: Fault[] = [];
  for (const f of failures.flat()) if (!faults.some((g) => g.phase === f.phase && g.element === f.element && g.mode === f.mode)) faults.push(f);
  let bypassState = bypass;
  if (bypass) {
    const p = phases[bypass.phase].patterns[tie];
    const unavailable =
      p === undefined
        ? 'no tie pattern'
        : p.status === 'forbidden'
          ? `the bypassed state shoots through: ${p.reason}`
          : (['+', '-'] as const)
              .map((s) =>
                p.bySign[s].level === 0
                  ? ''
                  : `for i ${s === '+' ? '>' : '<'} 0 ${p.unsafe[s] ? reasonInWords(p.unsafe[s] as string) : 'the output does not stay at 0'}`,
              )
              .filter(Boolean)
              .join('; ') || null;
    bypassState = { ...bypass, unavailable };
    if (unavailable !== null)
      throw new HexsalvageInputError(
        'option',
        '--bypass',
        'bypass',
        `a phase whose tied state is usable (phase ${bypass.phase}: ${unavailable})`,
        bypass.phase,
      );
  }
  return {
    topology: typeof options.topology === 'string' ? options.topology : base.name,
    leg,
    faults,
    failures,
    configurations,
    simulated,
    bypass: bypassState,
    phases,
    healthy,
    rules,
    unrated: unratedDevices(base),
  };
}

// The bypass to model: the phase checked, the DC node at 0 found, free names for the tie and its pattern.
function bypassOf(leg: LegNetlist, phase: unknown): BypassState {
  if (!(PHASES as readonly unknown[]).includes(phase))
    throw new HexsalvageInputError('option', '--bypass', 'bypass', `a phase, one of ${PHASES.join(', ')}`, phase);
  const node = Object.entries(leg.dcNodes).find(([, v]) => v === 0)?.[0];
  if (node === undefined)
    throw new HexsalvageInputError(
      'option',
      '--bypass',
      'bypass',
      'a leg with a DC node at potential 0 (a split DC link with a midpoint) to tie the phase to',
      leg.name,
    );
  const ids = new Set(expandElements(leg).map((e) => e.id));
  let device = 'bypass';
  for (let k = 2; ids.has(device); k++) device = `bypass${k}`;
  let pattern = 'bypass';
  for (let k = 2; pattern in leg.patterns; k++) pattern = `bypass${k}`;
  return { phase: phase as Phase, node, device, pattern, unavailable: null };
}

// The netlist with the tie (a device from the DC node at 0 to the output: shorted where the phase is
// bypassed, open elsewhere, rated for the whole link so that it is never the one overstressed) and
// the pattern "every gate off" that the bypassed phase uses.
function withTie(leg: LegNetlist, b: BypassState): LegNetlist {
  const pots = Object.values(leg.dcNodes);
  const span = Math.max(...pots) - Math.min(...pots);
  return parseNetlist(
    {
      ...leg,
      devices: [...leg.devices, { id: b.device, kind: 'diode', from: b.node, to: leg.output, rating: span }],
      patterns: { ...leg.patterns, [b.pattern]: [] },
    },
    'bypass',
  );
}
