import { HexsalvageInputError } from '../shared/errors.js';
import { expandElements } from './expandElements.js';
import type { LegNetlist } from './netlist.js';

/** Phase names of a three-phase converter, in Clarke order. */
export const PHASES = ['a', 'b', 'c'] as const;
/** One of {@link PHASES}. */
export type Phase = (typeof PHASES)[number];

/** Fault modes: `open` removes all conduction; `short` makes the element conduct both ways whatever its gate. */
export const FAULT_MODES = ['open', 'short'] as const;
/** One of {@link FAULT_MODES}. */
export type FaultMode = (typeof FAULT_MODES)[number];

/** A parsed fault: one element of one phase's leg. */
export interface Fault {
  readonly phase: Phase;
  /** Element id, e.g. `outerUpper` or `outerUpper.diode`. */
  readonly element: string;
  readonly mode: FaultMode;
}

/** Faults of one phase: element id → mode. */
export type PhaseFaults = ReadonlyMap<string, FaultMode>;

/**
 * Parses a fault string `PHASE.DEVICE[:MODE]` against a leg.
 *
 * @param text - e.g. `a.outerUpper`, `b.clampLower.diode`, `c.upper:open`
 * @param leg - the leg whose element ids are valid
 * @param input - name of the input for error messages (default `--fault`)
 * @returns the parsed fault (mode `open` when omitted)
 * @throws HexsalvageInputError naming the valid phases, elements or modes
 * @example
 * ```ts
 * parseFault('b.clampLower.diode', builtinLeg('anpc')); // { phase: 'b', element: 'clampLower.diode', mode: 'open' }
 * ```
 */
export function parseFault(text: string, leg: LegNetlist, input = '--fault'): Fault {
  const err = (key: string, expected: string, got?: unknown) => new HexsalvageInputError('fault', input, key, expected, got);
  if (typeof text !== 'string') throw err('(fault)', 'a string PHASE.DEVICE[:MODE]', text);
  const dot = text.indexOf('.');
  if (dot < 0) throw err(text, 'PHASE.DEVICE[:MODE], e.g. a.outerUpper or b.clampLower.diode:open', text);
  const phase = text.slice(0, dot);
  if (!(PHASES as readonly string[]).includes(phase)) throw err(text, `a phase, one of ${PHASES.join(', ')}`, phase);
  const rest = text.slice(dot + 1);
  const colon = rest.lastIndexOf(':');
  const element = colon < 0 ? rest : rest.slice(0, colon);
  const mode = colon < 0 ? 'open' : rest.slice(colon + 1);
  const ids = expandElements(leg).map((e) => e.id);
  if (!ids.includes(element)) throw err(text, `a device of leg "${leg.name}", one of ${ids.join(', ')}`, element);
  if (!(FAULT_MODES as readonly string[]).includes(mode)) throw err(text, `a fault mode, one of ${FAULT_MODES.join(', ')}`, mode);
  return { phase: phase as Phase, element, mode: mode as FaultMode };
}

/**
 * Parses several fault strings and groups them by phase.
 *
 * @param texts - fault strings; the same element named twice must have the same mode
 * @param leg - the leg the faults refer to
 * @param input - name of the input for error messages
 * @returns per phase, a map element id → mode (empty maps for healthy phases)
 * @example
 * ```ts
 * faultsByPhase(['a.outerUpper', 'c.clampUpper'], builtinLeg('npc')).a.get('outerUpper'); // 'open'
 * ```
 */
export function faultsByPhase(texts: readonly string[], leg: LegNetlist, input = '--fault'): Record<Phase, PhaseFaults> {
  const out: Record<Phase, Map<string, FaultMode>> = { a: new Map(), b: new Map(), c: new Map() };
  for (const t of texts) {
    const f = parseFault(t, leg, input);
    const prior = out[f.phase].get(f.element);
    if (prior !== undefined && prior !== f.mode) {
      throw new HexsalvageInputError('fault', input, t, `one mode per device (already given as ${prior})`, f.mode);
    }
    out[f.phase].set(f.element, f.mode);
  }
  return out;
}

/**
 * Canonical text of a fault, as accepted by {@link parseFault}.
 *
 * @param f - a fault
 * @returns `PHASE.DEVICE:MODE`
 * @example
 * ```ts
 * formatFault({ phase: 'a', element: 'upper', mode: 'open' }); // 'a.upper:open'
 * ```
 */
export function formatFault(f: Fault): string {
  return `${f.phase}.${f.element}:${f.mode}`;
}

/**
 * One reported failure: the element that failed, or the candidates a diagnosis could not tell
 * apart (one of them has failed). A plain fault is a failure with one alternative.
 */
export type Failure = readonly Fault[];

/** The most configurations (combinations of one alternative per failure) a fault list may make. */
export const MAX_CONFIGURATIONS = 64;

/**
 * Parses fault strings that may list alternatives separated by `|` (an ambiguous diagnosis, e.g.
 * `a.outerUpper|a.outerUpper.diode`): each string is one failure.
 *
 * @param texts - fault strings
 * @param leg - the leg the faults refer to
 * @param input - name of the input for error messages
 * @returns each failure's alternatives, in the order given
 * @throws HexsalvageInputError on an empty alternative, an element named twice in one failure, a
 *   bad fault, or more than {@link MAX_CONFIGURATIONS} combinations
 * @example
 * ```ts
 * parseFailures(['a.outerUpper|a.outerUpper.diode'], builtinLeg('npc'))[0]?.length; // 2
 * ```
 */
export function parseFailures(texts: readonly string[], leg: LegNetlist, input = '--fault'): Failure[] {
  let combinations = 1;
  const failures = texts.map((t) => {
    if (typeof t !== 'string') throw new HexsalvageInputError('fault', input, '(fault)', 'a string PHASE.DEVICE[:MODE], alternatives separated by |', t);
    const parts = t.split('|');
    const alternatives = parts.map((p) => {
      if (p.trim() === '') throw new HexsalvageInputError('fault', input, t, 'alternatives PHASE.DEVICE[:MODE] separated by | (one is empty)', t);
      return parseFault(p.trim(), leg, input);
    });
    const seen = new Set<string>();
    for (const f of alternatives) {
      const key = `${f.phase}.${f.element}`;
      if (seen.has(key)) throw new HexsalvageInputError('fault', input, t, 'each element at most once among the alternatives of one failure', key);
      seen.add(key);
    }
    combinations *= alternatives.length;
    if (combinations > MAX_CONFIGURATIONS)
      throw new HexsalvageInputError('fault', input, t, `at most ${MAX_CONFIGURATIONS} combinations of alternatives in all (a documented limit)`, combinations);
    return alternatives;
  });
  return failures;
}

/**
 * Every combination of one alternative per failure that names each element with one mode only (a
 * combination that would give one element two modes cannot happen and is left out).
 *
 * @param failures - from {@link parseFailures}
 * @returns the configurations, each a list of faults (the first alternative of each failure first)
 * @example
 * ```ts
 * failureConfigurations(parseFailures(['a.x|a.y', 'b.z'], leg)).length; // 2
 * ```
 */
export function failureConfigurations(failures: readonly Failure[]): Fault[][] {
  let configs: Fault[][] = [[]];
  for (const alternatives of failures) configs = configs.flatMap((c) => alternatives.map((f) => [...c, f]));
  return configs.filter((c) => {
    const mode = new Map<string, FaultMode>();
    return c.every((f) => {
      const key = `${f.phase}.${f.element}`;
      const prior = mode.get(key);
      mode.set(key, f.mode);
      return prior === undefined || prior === f.mode;
    });
  });
}

/**
 * Canonical text of a failure: its alternatives joined by `|`.
 *
 * @param f - a failure
 * @returns e.g. `a.outerUpper:open|a.outerUpper.diode:open`
 * @example
 * ```ts
 * formatFailure([{ phase: 'a', element: 'upper', mode: 'open' }]); // 'a.upper:open'
 * ```
 */
export function formatFailure(f: Failure): string {
  return f.map(formatFault).join('|');
}
