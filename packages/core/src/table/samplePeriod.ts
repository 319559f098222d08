import { createRuntime, type RuntimeOptions } from './createRuntime.js';
import { HexsalvageInputError } from '../shared/errors.js';
import { parsePolarity, POLARITY_STRINGS, type PolarityString } from '../leg/polarity.js';
import type { SwitchingTable } from './switchingTable.js';
import { requireNumber, requireObject, requireTable } from '../shared/validate.js';

/** One state of a sampled switching period. */
export interface PeriodState {
  readonly levels: readonly [number, number, number];
  readonly patterns: readonly [string, string, string];
  readonly gates: readonly [readonly string[], readonly string[], readonly string[]];
  /** Fraction of the switching period. */
  readonly duration: number;
}

/** One switching period as the runtime applies it. */
export interface SampledPeriod {
  readonly polarity: PolarityString;
  /** Triangle of the polarity, −1 where it has none (then no states). */
  readonly triangle: number;
  readonly states: readonly PeriodState[];
  /** Share of the split vertex's dwell in its first realisation (NaN: none split). */
  readonly split: number;
  readonly held: boolean;
  readonly clamped: boolean;
}

/** Options of {@link samplePeriod}. */
export interface SamplePeriodOptions extends Omit<RuntimeOptions, 'midpointGain'> {
  /** Reference α and β, units of Vdc/2. */
  readonly alpha: number;
  readonly beta: number;
  readonly polarity: PolarityString;
  /** Phase currents at the sample (any unit). Default: none (0, 0, 0). */
  readonly currents?: readonly [number, number, number];
}

/**
 * One switching period from a fresh runtime (no previous state) at one reference, for drawings
 * and reports: the states in time order with their gates and durations.
 *
 * @param table - from `switchingTable`
 * @param options - the reference, the polarity and the runtime settings
 * @returns the period
 * @throws HexsalvageInputError on bad options
 * @example
 * ```ts
 * samplePeriod(switchingTable({ topology: 'npc' }), { alpha: 0.5, beta: 0.2, polarity: '+--' }).states.length; // 7
 * ```
 */
export function samplePeriod(table: SwitchingTable, options: SamplePeriodOptions): SampledPeriod {
  requireTable(table, 'samplePeriod');
  requireObject(options, 'samplePeriod', 'an options object { alpha, beta, polarity, currents?, sequence?, balance? }');
  const alpha = requireNumber(options.alpha, 'samplePeriod', 'alpha', { min: -1e6, max: 1e6 });
  const beta = requireNumber(options.beta, 'samplePeriod', 'beta', { min: -1e6, max: 1e6 });
  parsePolarity(options.polarity, 'samplePeriod.polarity');
  const currents = options.currents ?? [0, 0, 0];
  if (!Array.isArray(currents) || currents.length !== 3 || !currents.every((x) => Number.isFinite(x)))
    throw new HexsalvageInputError('option', 'samplePeriod', 'currents', 'three finite phase currents', currents);
  const rt = createRuntime(table, { sequence: options.sequence, balance: options.balance, chainDwell: options.chainDwell });
  const out = rt.output();
  const qi = POLARITY_STRINGS.indexOf(options.polarity);
  const t = rt.period(alpha, beta, qi, currents[0], currents[1], currents[2], 0, out);
  const states: PeriodState[] = [];
  for (let s = 0; t >= 0 && s < out.count; s++) {
    const patterns = [0, 1, 2].map((k) => table.patterns[out.patterns[3 * s + k] as number] as string) as unknown as [string, string, string];
    states.push({
      levels: [out.levels[3 * s] as number, out.levels[3 * s + 1] as number, out.levels[3 * s + 2] as number],
      patterns,
      gates: patterns.map((p) => table.patternGates[table.patterns.indexOf(p)] ?? []) as unknown as [string[], string[], string[]],
      duration: out.duration[s] as number,
    });
  }
  return { polarity: options.polarity, triangle: t, states, split: out.split, held: out.held, clamped: out.clamped };
}
