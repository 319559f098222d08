import { HexsalvageInputError } from './errors.js';
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
