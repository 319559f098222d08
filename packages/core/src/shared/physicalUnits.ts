import { HexsalvageInputError } from './errors.js';

/** Volts of a plan at a DC-link voltage (contract "Physical units"). */
export interface PlanVolts {
  /** Total DC-link voltage, volts. */
  readonly vdc: number;
  /** mMax·Vdc/2: the largest peak fundamental phase voltage, volts. */
  readonly phasePeakMax: number;
  /** mMax·(Vdc/2)·√(3/2): the largest line-to-line RMS fundamental voltage, volts. */
  readonly lineRmsMax: number;
  readonly phasePeakMaxHealthy: number;
  readonly lineRmsMaxHealthy: number;
}

/**
 * Peak fundamental phase voltage of a modulation index: m·Vdc/2 (m is in units of Vdc/2).
 *
 * @param m - modulation index
 * @param vdc - total DC-link voltage, volts
 * @returns volts
 * @example
 * ```ts
 * phasePeakVolts(1, 750); // 375
 * ```
 */
export function phasePeakVolts(m: number, vdc: number): number {
  return (m * vdc) / 2;
}

/**
 * Line-to-line RMS fundamental voltage of a modulation index: m·(Vdc/2)·√(3/2), i.e. the phase
 * peak times √3 (line from phase) divided by √2 (RMS from peak).
 *
 * @param m - modulation index
 * @param vdc - total DC-link voltage, volts
 * @returns volts
 * @example
 * ```ts
 * lineRmsVolts(2 / Math.sqrt(3), 750); // ≈ 530.3: a 750 V link gives at most 530 V line RMS
 * ```
 */
export function lineRmsVolts(m: number, vdc: number): number {
  return ((m * vdc) / 2) * Math.sqrt(1.5);
}

/**
 * The modulation index of a line-to-line RMS voltage (inverse of {@link lineRmsVolts}).
 *
 * @param lineRmsV - volts RMS, line to line
 * @param vdc - total DC-link voltage, volts
 * @returns m in units of Vdc/2
 * @example
 * ```ts
 * modulationOfLineRms(400, 750); // ≈ 0.871
 * ```
 */
export function modulationOfLineRms(lineRmsV: number, vdc: number): number {
  return lineRmsV / ((vdc / 2) * Math.sqrt(1.5));
}

/**
 * Checks a DC-link voltage option.
 *
 * @param v - the value
 * @param input - where it came from (for the error)
 * @param key - its name
 * @returns the value, a finite number of volts above 0
 * @example
 * ```ts
 * requireVdc(750, 'options', 'vdc'); // 750
 * ```
 */
export function requireVdc(v: unknown, input: string, key: string): number {
  if (typeof v !== 'number' || !Number.isFinite(v) || v <= 0 || v > 1e7)
    throw new HexsalvageInputError('option', input, key, 'a DC-link voltage in volts, above 0 and at most 1e7', v);
  return v;
}

/**
 * The `volts` block of a plan.
 *
 * @param mMax - the faulted limit
 * @param mMaxHealthy - the healthy limit
 * @param vdc - total DC-link voltage, volts
 * @returns the block
 * @example
 * ```ts
 * planVolts(0.5774, 1.1547, 750).lineRmsMax; // ≈ 265
 * ```
 */
export function planVolts(mMax: number, mMaxHealthy: number, vdc: number): PlanVolts {
  return {
    vdc,
    phasePeakMax: phasePeakVolts(mMax, vdc),
    lineRmsMax: lineRmsVolts(mMax, vdc),
    phasePeakMaxHealthy: phasePeakVolts(mMaxHealthy, vdc),
    lineRmsMaxHealthy: lineRmsVolts(mMaxHealthy, vdc),
  };
}
