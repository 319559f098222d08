import {
  LEVEL_STEP_RULES,
  PHASES,
  SEQUENCE_MODES,
  UPDATE_MODES,
  type LegNetlist,
  type LevelStepRule,
  type Phase,
  type SequenceMode,
  type UpdateMode,
} from '@hexsalvage/core';
import { usage, type ParsedArgs } from './args.js';
import { loadTopology } from './loadTopology.js';

/** The leg options every leg command reads. */
export interface LegInputs {
  readonly topology: string | LegNetlist;
  /** The `--topology` text as given (built-in id or path), for display. */
  readonly topologyText: string;
  readonly faults: readonly string[];
  /** `--ignore-ratings` and `--level-steps`. */
  readonly rules: { readonly ignoreRatings: boolean; readonly levelSteps: LevelStepRule };
}

/**
 * Reads `--topology` (required) and `--fault` from parsed arguments.
 *
 * @param args - parsed command line
 * @returns topology (id or netlist) and fault strings
 * @throws HexsalvageInputError when `--topology` is missing or unreadable
 * @example
 * ```ts
 * const { topology, faults } = legInputs(args);
 * ```
 */
export function legInputs(args: ParsedArgs): LegInputs {
  const t = args.values.get('topology');
  if (typeof t !== 'string') throw usage('--topology', 'a built-in leg id or a netlist file');
  return { topology: loadTopology(t), topologyText: t, faults: args.lists.get('fault') ?? [], rules: ruleInputs(args) };
}

/**
 * Reads `--load-angle` and `--polarity-margin` with their defaults and checks their ranges.
 *
 * @param args - parsed command line
 * @returns load angle and margin in degrees
 * @throws HexsalvageInputError when out of range
 * @example
 * ```ts
 * angleInputs(args); // { loadAngleDeg: 0, polarityMarginDeg: 0 }
 * ```
 */
export function angleInputs(args: ParsedArgs): { loadAngleDeg: number; polarityMarginDeg: number } {
  const loadAngleDeg = (args.values.get('load-angle') as number | undefined) ?? 0;
  const polarityMarginDeg = (args.values.get('polarity-margin') as number | undefined) ?? 0;
  if (loadAngleDeg < -180 || loadAngleDeg > 180) throw usage('--load-angle', 'degrees in [-180, 180]', loadAngleDeg);
  if (polarityMarginDeg < 0 || polarityMarginDeg >= 60) throw usage('--polarity-margin', 'degrees in [0, 60)', polarityMarginDeg);
  return { loadAngleDeg, polarityMarginDeg };
}

/**
 * Reads `--ignore-ratings` and `--level-steps`.
 *
 * @param args - parsed command line
 * @returns rule options for the core (absent keys keep the safe defaults)
 * @throws HexsalvageInputError for an unknown level-step rule
 * @example
 * ```ts
 * ruleInputs(args); // { ignoreRatings: false, levelSteps: 'commutable' }
 * ```
 */
export function ruleInputs(args: ParsedArgs): { ignoreRatings: boolean; levelSteps: LevelStepRule; bypass?: Phase } {
  const steps = args.values.get('level-steps') ?? 'commutable';
  if (!(LEVEL_STEP_RULES as readonly unknown[]).includes(steps)) throw usage('--level-steps', `one of ${LEVEL_STEP_RULES.join(', ')}`, steps);
  const bypass = args.lists.get('bypass') ?? [];
  if (bypass.length > 1)
    throw usage(
      '--bypass',
      'one phase at most (with two tied to the midpoint only one phase is left to modulate: no line-to-line voltage can be controlled)',
      bypass.join(', '),
    );
  const phase = bypass[0];
  if (phase !== undefined && !(PHASES as readonly string[]).includes(phase)) throw usage('--bypass', `a phase, one of ${PHASES.join(', ')}`, phase);
  return { ignoreRatings: args.flags.has('ignore-ratings'), levelSteps: steps as LevelStepRule, ...(phase === undefined ? {} : { bypass: phase as Phase }) };
}

/**
 * The `--vdc` value, if given.
 *
 * @param args - parsed arguments
 * @returns total DC-link voltage in volts, or undefined
 * @example
 * ```ts
 * vdcInput(args); // 750 for --vdc 750
 * ```
 */
export function vdcInput(args: ParsedArgs): number | undefined {
  return args.values.get('vdc') as number | undefined;
}

/**
 * Reads `--sequence` and `--balance` with their defaults.
 *
 * @param args - parsed command line
 * @returns the runtime settings
 * @throws HexsalvageInputError for an unknown value
 * @example
 * ```ts
 * runtimeInputs(args); // { sequence: 'continuous', balance: 'on' }
 * ```
 */
export function runtimeInputs(args: ParsedArgs): { sequence: SequenceMode; balance: 'on' | 'off' } {
  const sequence = args.values.get('sequence') ?? 'continuous';
  if (!(SEQUENCE_MODES as readonly unknown[]).includes(sequence)) throw usage('--sequence', `one of ${SEQUENCE_MODES.join(', ')}`, sequence);
  const balance = args.values.get('balance') ?? 'on';
  if (balance !== 'on' && balance !== 'off') throw usage('--balance', 'on or off', balance);
  return { sequence: sequence as SequenceMode, balance };
}

/**
 * Reads `--update`: when the runtime samples the reference.
 *
 * @param args - parsed command line
 * @param fallback - the command's default
 * @returns `period` or `half`
 * @throws HexsalvageInputError for an unknown value
 * @example
 * ```ts
 * updateInput(args, 'period');
 * ```
 */
export function updateInput(args: ParsedArgs, fallback: UpdateMode): UpdateMode {
  const u = args.values.get('update') ?? fallback;
  if (!(UPDATE_MODES as readonly unknown[]).includes(u)) throw usage('--update', `one of ${UPDATE_MODES.join(', ')}`, u);
  return u as UpdateMode;
}
