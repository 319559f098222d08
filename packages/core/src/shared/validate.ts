import { HexsalvageInputError } from './errors.js';

/**
 * Checks that a function's options argument is a plain object (not `undefined`, `null`, an array or
 * a primitive), so that a bad call fails with a typed error instead of a `TypeError` deep inside.
 *
 * @param v - the argument
 * @param input - the function's name, for the message
 * @param what - what was expected, e.g. `an options object { topology, faults? }`
 * @returns the argument, typed as a record
 * @throws HexsalvageInputError (code `option`)
 * @example
 * ```ts
 * requireObject(options, 'planRemedial', 'an options object { topology, faults? }');
 * ```
 */
export function requireObject(v: unknown, input: string, what: string): Record<string, unknown> {
  if (typeof v !== 'object' || v === null || Array.isArray(v)) throw new HexsalvageInputError('option', input, '(argument)', what, v);
  return v as Record<string, unknown>;
}

/** Range of {@link requireNumber}. */
export interface NumberRange {
  readonly min?: number;
  readonly max?: number;
  /** Exclude `min` itself. */
  readonly openMin?: boolean;
  /** Exclude `max` itself. */
  readonly openMax?: boolean;
  readonly integer?: boolean;
}

/**
 * Checks a numeric option: finite, in range, and whole where asked.
 *
 * @param v - the value
 * @param input - the function's name
 * @param key - the option's name
 * @param range - accepted range
 * @returns the number
 * @throws HexsalvageInputError (code `option`) naming the option and the range
 * @example
 * ```ts
 * requireNumber(options.stepDeg ?? 1, 'deratingCurve', 'stepDeg', { min: 0, openMin: true, max: 360 });
 * ```
 */
export function requireNumber(v: unknown, input: string, key: string, range: NumberRange = {}): number {
  const { min = -Infinity, max = Infinity, openMin = false, openMax = false, integer = false } = range;
  const ok =
    typeof v === 'number' && Number.isFinite(v) && (openMin ? v > min : v >= min) && (openMax ? v < max : v <= max) && (!integer || Number.isInteger(v));
  if (!ok) {
    const lo = Number.isFinite(min) ? `${openMin ? 'above' : 'from'} ${min}` : '';
    const hi = Number.isFinite(max) ? `${openMax ? 'below' : 'up to'} ${max}` : '';
    throw new HexsalvageInputError(
      'option',
      input,
      key,
      `${integer ? 'a whole number' : 'a finite number'}${lo || hi ? ` ${[lo, hi].filter(Boolean).join(' ')}` : ''}`,
      v,
    );
  }
  return v as number;
}

/**
 * Checks that an argument is a switching table from `switchingTable` (or its JSON).
 *
 * @param v - the argument
 * @param input - the function's name, for the message
 * @throws HexsalvageInputError (code `option`)
 * @example
 * ```ts
 * requireTable(table, 'exportC');
 * ```
 */
export function requireTable(v: unknown, input: string): void {
  const t = v as { kind?: unknown; polarities?: unknown; phaseSteps?: unknown } | null;
  if (typeof t !== 'object' || t === null || t.kind !== 'hexsalvage-switching-table' || typeof t.polarities !== 'object' || typeof t.phaseSteps !== 'object') {
    throw new HexsalvageInputError('option', input, '(table)', 'a switching table from switchingTable()', v);
  }
}

/**
 * Checks that an argument is a diagram atlas from `diagramAtlas`.
 *
 * @param v - the argument
 * @param input - the function's name, for the message
 * @throws HexsalvageInputError (code `option`)
 * @example
 * ```ts
 * requireAtlas(atlas, 'deratingCurve');
 * ```
 */
export function requireAtlas(v: unknown, input: string): void {
  const a = v as { analysis?: unknown; faulted?: unknown; healthy?: unknown } | null;
  if (typeof a !== 'object' || a === null || typeof a.analysis !== 'object' || !(a.faulted instanceof Map) || !(a.healthy instanceof Map)) {
    throw new HexsalvageInputError('option', input, '(atlas)', 'a diagram atlas from diagramAtlas()', v);
  }
}
