import { HexsalvageInputError } from '../shared/errors.js';
import type { PhasePolarity } from './conduction.js';

/** A polarity string: one of `+`, `-`, `?` per phase in the order a, b, c, e.g. `+-?`. */
export type PolarityString = string;

const SYMBOLS: readonly PhasePolarity[] = ['+', '-', '?'];

/**
 * The 25 polarity strings a three-wire load can show: every string of `+`, `-`, `?` per phase
 * except `+++` and `---` (the three currents sum to zero, so they never share one sign).
 * Ordered as a base-3 count with digit order `+`, `-`, `?` and phase a most significant; the
 * index in this list is the polarity index of the exported tables.
 */
export const POLARITY_STRINGS: readonly PolarityString[] = (() => {
  const out: string[] = [];
  for (const a of SYMBOLS)
    for (const b of SYMBOLS)
      for (const c of SYMBOLS) {
        const s = `${a}${b}${c}`;
        if (s !== '+++' && s !== '---') out.push(s);
      }
  return out;
})();

/**
 * Validates a polarity string.
 *
 * @param text - candidate, e.g. `+-?`
 * @param input - input name for the error message (default `--polarity`)
 * @returns the per-phase polarities `[a, b, c]`
 * @throws HexsalvageInputError unless the text is three of `+`, `-`, `?` and not `+++`/`---`
 * @example
 * ```ts
 * parsePolarity('+-?'); // ['+', '-', '?']
 * ```
 */
export function parsePolarity(text: unknown, input = '--polarity'): [PhasePolarity, PhasePolarity, PhasePolarity] {
  if (typeof text !== 'string' || !/^[+\-?]{3}$/.test(text)) {
    throw new HexsalvageInputError('polarity', input, 'polarity', 'three characters of +, - or ? (phases a, b, c), e.g. +-?', text);
  }
  if (text === '+++' || text === '---') {
    throw new HexsalvageInputError('polarity', input, 'polarity', 'a pattern a three-wire load can show (not +++ or ---)', text);
  }
  return [...text] as [PhasePolarity, PhasePolarity, PhasePolarity];
}
