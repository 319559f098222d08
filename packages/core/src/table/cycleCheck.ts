import { HexsalvageInputError } from '../shared/errors.js';
import { requireNumber, requireObject, requireTable } from '../shared/validate.js';
import { MIDPOINT_TOLERANCE, midpointProfile, midpointRangeAt } from '../limits/midpointBalance.js';
import type { RuntimeOptions, SequenceMode } from './createRuntime.js';
import { runtimeStream, type StreamEntry, type StreamSegment, type UpdateMode } from './runtimeStream.js';
import type { SwitchingTable } from './switchingTable.js';

/** Options of {@link cycleCheck}: the operating point and the runtime's settings. */
export interface CycleCheckOptions extends Omit<RuntimeOptions, 'midpointGain'> {
  /** Modulation index to run at (units of Vdc/2); should not exceed the plan's mMax. */
  readonly m: number;
  /** Load angle φ, degrees. Default 0. */
  readonly loadAngleDeg?: number;
  /** Polarity margin δ, degrees. Default 0. */
  readonly polarityMarginDeg?: number;
  /** Switching periods per fundamental period (fsw/f1), an integer from 6 to 20000. Default 120. */
  readonly frequencyRatio?: number;
  /** Peak phase current, in the user's unit (A). Default 1. */
  readonly currentAmplitude?: number;
  /** Average midpoint current (fraction of the amplitude) above which the runtime is said to drift. Default 0.002. */
  readonly driftThreshold?: number;
  /** When the runtime samples: once per switching period (default) or at each half. */
  readonly update?: UpdateMode;
  /** Share of the accumulated midpoint charge the runtime removes per update (the firmware's loop). Default 0.5. */
  readonly midpointFeedback?: number;
  /** Include the stream (every segment of the period). Default false. */
  readonly stream?: boolean;
}

/** What one fundamental period of the runtime does. */
export interface CycleReport {
  readonly periods: number;
  readonly update: UpdateMode;
  readonly sequence: SequenceMode;
  readonly balance: 'on' | 'off';
  /** Largest |applied − reference| volt-second average over the updates not clamped (units of Vdc/2). */
  readonly voltSecondErrorMax: number;
  /** Updates whose reference lay outside the tiling and were clamped. */
  readonly clampedPeriods: number;
  /** Steps (wrap-around included) that change two or more phases at once. */
  readonly multiPhaseSteps: number;
  /** States the runtime inserted to chain periods, one phase per step. */
  readonly chainSteps: number;
  /** Updates in which no safe step led into the reference's triangle: the runtime held its state (the reference was not followed). */
  readonly heldPeriods: number;
  /** The stream repeats from period to period and its midpoint charge has settled. */
  readonly periodic: boolean;
  /** Average current into the midpoint node over the period, in the unit of `currentAmplitude`. */
  readonly midpointCurrent: {
    /** What the runtime draws (its own states, sinusoidal currents, steady state). */
    readonly runtime: number;
    /** The value nearest zero that splitting redundant dwell between realisations can reach (null: m leaves the tiling). */
    readonly bestPolicy: number | null;
    /** The range of averages the redundancy can reach (the computation behind `mMaxBalanced`). */
    readonly reachable: readonly [number, number] | null;
  };
  /** True when zero average midpoint current is out of reach (m above the plan's `mMaxBalanced`). */
  readonly midpointDrift: boolean;
  /** True when the runtime's own average is above the drift threshold. */
  readonly runtimeDrift: boolean;
  /** Gate changes per fundamental period, per `phase.device`. */
  readonly gateChangesPerCycle: Readonly<Record<string, number>>;
  /** Every segment of the period (with `stream: true`), times as fractions of the period. */
  readonly stream?: readonly StreamSegment[];
  /**
   * With `stream: true`: the state the period starts from (the previous period's last state; the
   * stream's own last state when `periodic`). The first step is from it into the first segment.
   */
  readonly streamEntry?: StreamEntry;
}

/**
 * Runs the runtime through one fundamental period in steady state and checks what it does:
 * volt-second balance, how it chains periods, the midpoint current it draws, gate changes.
 *
 * The runtime (`createRuntime`) takes the reference at each update's centre, the polarity there,
 * and the currents `I·cos(θ − φ − k·120°)` measured there; its midpoint error is the charge the
 * stream's own states have drawn from sinusoidal currents so far (a firmware's measured midpoint
 * voltage). The reachable range is the one `mMaxBalanced` is decided on, so the plan and this
 * check agree on whether balance is possible at all.
 *
 * @param table - from `switchingTable`
 * @param options - operating point and runtime settings
 * @returns what the period does
 * @throws HexsalvageInputError on invalid options
 * @example
 * ```ts
 * cycleCheck(switchingTable({ topology: 'npc', faults: ['a.outerUpper'] }), { m: 0.5, loadAngleDeg: 30 });
 * ```
 */
export function cycleCheck(table: SwitchingTable, options: CycleCheckOptions): CycleReport {
  requireTable(table, 'cycleCheck');
  requireObject(
    options,
    'cycleCheck',
    'an options object { m, loadAngleDeg?, polarityMarginDeg?, frequencyRatio?, currentAmplitude?, sequence?, balance?, update? }',
  );
  const { m } = options;
  const phi = options.loadAngleDeg ?? 0;
  const delta = options.polarityMarginDeg ?? 0;
  const n = options.frequencyRatio ?? 120;
  const amp = options.currentAmplitude ?? 1;
  const threshold = options.driftThreshold ?? 0.002;
  const bad = (key: string, expected: string, got: unknown) => new HexsalvageInputError('option', 'cycleCheck', key, expected, got);
  if (!(Number.isFinite(m) && m >= 0 && m <= 10)) throw bad('m', 'a modulation index from 0 to 10', m);
  if (!(Number.isInteger(n) && n >= 6 && n <= 20000)) throw bad('frequencyRatio', 'an integer from 6 to 20000', n);
  if (!(Number.isFinite(amp) && amp > 0 && amp <= 1e9)) throw bad('currentAmplitude', 'a positive current up to 1e9', amp);
  requireNumber(phi, 'cycleCheck', 'loadAngleDeg', { min: -180, max: 180 });
  requireNumber(delta, 'cycleCheck', 'polarityMarginDeg', { min: 0, max: 60, openMax: true });
  requireNumber(threshold, 'cycleCheck', 'driftThreshold', { min: 0, max: 1 });
  const s = runtimeStream(table, { ...options, m, loadAngleDeg: phi, polarityMarginDeg: delta, frequencyRatio: n });
  // the sweep gives the current the leg draws out of the midpoint; the documents give it into it
  const range = midpointRangeAt(midpointProfile(table.polarities, m, phi, delta), m);
  const reachable: [number, number] | null = range ? [-range[1] * amp, -range[0] * amp] : null;
  const best = reachable ? Math.min(Math.max(0, reachable[0]), reachable[1]) : null;
  return {
    periods: n,
    update: options.update ?? 'period',
    sequence: options.sequence ?? 'continuous',
    balance: options.balance ?? 'on',
    voltSecondErrorMax: s.voltSecondErrorMax,
    clampedPeriods: s.clampedUpdates,
    multiPhaseSteps: s.multiPhaseSteps,
    chainSteps: s.chainSteps,
    heldPeriods: s.heldUpdates,
    periodic: s.periodic,
    midpointCurrent: { runtime: s.midpointAverage * amp, bestPolicy: best, reachable },
    midpointDrift: !reachable || reachable[0] > MIDPOINT_TOLERANCE * amp || reachable[1] < -MIDPOINT_TOLERANCE * amp,
    runtimeDrift: Math.abs(s.midpointAverage) > threshold,
    gateChangesPerCycle: s.gateChanges,
    ...(options.stream ? { stream: s.segments, streamEntry: s.entry } : {}),
  };
}
