import { BUILTIN_TOPOLOGIES, type FaultMode, type LegNetlist, type LevelStepRule, type Phase } from '@hexsalvage/core';

/** What is on screen: the leg, its failed elements and the operating point. Plain data. */
export interface ExplorerState {
  /** A built-in leg id, or `file:NAME` for a netlist opened from disk. */
  readonly topology: string;
  /** The netlist of a `file:` leg. */
  readonly netlist?: LegNetlist;
  /** Failed elements by address `PHASE.ID` (insertion order = the order faults are written). */
  readonly faults: ReadonlyMap<string, FaultMode>;
  /** Addresses whose diagnosis cannot tell the switch from its antiparallel diode. */
  readonly ambiguous: ReadonlySet<string>;
  /** The phase tied to the DC midpoint by a fitted bypass, or none. */
  readonly bypass: Phase | null;
  readonly loadAngleDeg: number;
  readonly polarityMarginDeg: number;
  readonly levelSteps: LevelStepRule;
  /** Total DC-link voltage in volts, or none (per unit only). */
  readonly vdc: number | null;
}

/** The built-in legs the picker offers, in the contract's order. */
export const PICKER_LEGS: readonly string[] = BUILTIN_TOPOLOGIES;

/**
 * A fresh state for a leg: healthy, at load angle 0, polarity margin 0, the default level-step rule.
 *
 * @param topology - a built-in id or `file:NAME`
 * @param netlist - the netlist of a `file:` leg
 * @param vdc - the DC-link voltage to keep, or null
 * @returns the state
 * @example
 * ```ts
 * initialState('npc', undefined, 750).faults.size; // 0
 * ```
 */
export function initialState(topology: string, netlist?: LegNetlist, vdc: number | null = null): ExplorerState {
  return {
    topology,
    ...(netlist ? { netlist } : {}),
    faults: new Map(),
    ambiguous: new Set(),
    bypass: null,
    loadAngleDeg: 0,
    polarityMarginDeg: 0,
    levelSteps: 'commutable',
    vdc,
  };
}

/**
 * The state after a click on an element: healthy → open → short → healthy.
 *
 * @param state - the state before
 * @param address - `PHASE.ID` of the element clicked
 * @returns the new state (the element's ambiguity is dropped when it heals)
 * @example
 * ```ts
 * cycleDevice(initialState('npc'), 'a.outerUpper').faults.get('a.outerUpper'); // 'open'
 * ```
 */
export function cycleDevice(state: ExplorerState, address: string): ExplorerState {
  const faults = new Map(state.faults);
  const ambiguous = new Set(state.ambiguous);
  const now = faults.get(address);
  if (now === undefined) faults.set(address, 'open');
  else if (now === 'open') faults.set(address, 'short');
  else {
    faults.delete(address);
    ambiguous.delete(address);
  }
  return { ...state, faults, ambiguous };
}

/**
 * The element a diagnosis may confuse with `address`: a switch's antiparallel diode, or the switch
 * of an antiparallel diode; none for a discrete element.
 *
 * @param address - `PHASE.ID`
 * @param leg - the leg
 * @returns the partner's address, or null
 * @example
 * ```ts
 * partnerOf('a.outerUpper', builtinLeg('npc')); // 'a.outerUpper.diode'
 * ```
 */
export function partnerOf(address: string, leg: LegNetlist): string | null {
  const dot = address.indexOf('.');
  const phase = address.slice(0, dot);
  const id = address.slice(dot + 1);
  if (id.endsWith('.diode')) return `${phase}.${id.slice(0, -'.diode'.length)}`;
  return leg.devices.some((d) => d.id === id && d.antiparallelDiode) ? `${phase}.${id}.diode` : null;
}

/**
 * The fault strings of the state as the CLI takes them: `PHASE.ID:MODE`, and for an ambiguous
 * diagnosis the element and its partner with the same mode, separated by `|`.
 *
 * @param state - the state
 * @param leg - its leg
 * @returns the fault strings, in the order the faults were set
 * @example
 * ```ts
 * faultStrings(cycleDevice(initialState('npc'), 'a.outerUpper'), builtinLeg('npc')); // ['a.outerUpper:open']
 * ```
 */
export function faultStrings(state: ExplorerState, leg: LegNetlist): string[] {
  return [...state.faults].map(([address, mode]) => {
    const partner = state.ambiguous.has(address) ? partnerOf(address, leg) : null;
    return partner && !state.faults.has(partner) ? `${address}:${mode}|${partner}:${mode}` : `${address}:${mode}`;
  });
}

/**
 * The command line that computes what is on screen, for a terminal (POSIX shell quoting).
 *
 * @param command - `plan` or `report`
 * @param state - the state
 * @param leg - its leg
 * @param extra - further arguments (e.g. `--out`, `review.html`)
 * @returns one line
 * @example
 * ```ts
 * commandLineOf('plan', initialState('npc'), builtinLeg('npc')); // 'hexsalvage plan --topology npc --load-angle 0 --polarity-margin 0'
 * ```
 */
export function commandLineOf(command: string, state: ExplorerState, leg: LegNetlist, extra: readonly string[] = []): string {
  const q = (v: string) => (/^[\w@%+=:,./-]+$/.test(v) ? v : `'${v.replace(/'/g, `'\\''`)}'`);
  const topology = state.topology.startsWith('file:') ? state.topology.slice(5) : state.topology;
  const parts = ['hexsalvage', command, '--topology', q(topology)];
  for (const f of faultStrings(state, leg)) parts.push('--fault', q(f));
  parts.push('--load-angle', String(state.loadAngleDeg), '--polarity-margin', String(state.polarityMarginDeg));
  if (state.levelSteps !== 'commutable') parts.push('--level-steps', state.levelSteps);
  if (state.bypass) parts.push('--bypass', state.bypass);
  if (state.vdc !== null) parts.push('--vdc', String(state.vdc));
  return [...parts, ...extra.map(q)].join(' ');
}
