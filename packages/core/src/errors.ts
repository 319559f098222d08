/**
 * Kinds of input problems hexsalvage reports. Every public entry point validates its input and
 * throws a {@link HexsalvageInputError} with one of these codes; nothing deeper in the engine
 * throws for numerical reasons (those are reported as data).
 */
export type InputErrorCode =
  | 'netlist'
  | 'fault'
  | 'topology'
  | 'polarity'
  | 'option'
  | 'claims'
  | 'scenario'
  | 'usage';

/**
 * A typed error for bad input: names the input, the key and what was expected.
 *
 * @example
 * ```ts
 * throw new HexsalvageInputError('netlist', 'leg.json', 'devices[2].from', 'a node name (string)', 42);
 * ```
 */
export class HexsalvageInputError extends Error {
  /** Which family of input was wrong. */
  readonly code: InputErrorCode;
  /** The input that was read: a file name, `options`, `--fault`, … */
  readonly input: string;
  /** Where inside the input: a key path such as `devices[2].from`. */
  readonly key: string;
  /** What would have been accepted. */
  readonly expected: string;

  /**
   * @param code - error family
   * @param input - the input that was read (file name, option name)
   * @param key - key path inside the input
   * @param expected - what would have been accepted
   * @param got - the offending value, shown abbreviated
   */
  constructor(code: InputErrorCode, input: string, key: string, expected: string, got?: unknown) {
    const shown = got === undefined ? '' : `, got ${describeValue(got)}`;
    // input and key may carry user text (a file name, a fault string): one line, bounded length
    super(`${plainText(input, 120)}: ${plainText(key, 80)}: expected ${plainText(expected, 600)}${shown}`);
    this.name = 'HexsalvageInputError';
    this.code = code;
    this.input = input;
    this.key = key;
    this.expected = expected;
  }
}

/**
 * User text made safe for a one-line message: control characters (newlines included) escaped as
 * in JSON, and cut to `max` characters with `...`.
 *
 * @param text - the text
 * @param max - longest result, in characters
 * @returns a single line
 * @example
 * ```ts
 * plainText('a\nb', 80); // 'a\\nb'
 * ```
 */
export function plainText(text: string, max: number): string {
  const named: Record<string, string> = { '\n': '\\n', '\r': '\\r', '\t': '\\t' };
  // eslint-disable-next-line no-control-regex
  const esc = text.replace(/[\u0000-\u001f\u007f-\u009f\u2028\u2029]/g, (c) => named[c] ?? `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}`);
  return esc.length > max ? `${esc.slice(0, max - 3)}...` : esc;
}

/** Short, single-line rendering of an offending value for error messages. */
function describeValue(v: unknown): string {
  if (typeof v === 'string') return JSON.stringify(v.length > 60 ? `${v.slice(0, 57)}...` : v);
  if (typeof v === 'number' || typeof v === 'boolean' || v === null) return String(v);
  if (Array.isArray(v)) return 'an array';
  return typeof v === 'object' ? 'an object' : typeof v;
}
