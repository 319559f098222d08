/**
 * Kinds of input problems hexsalvage reports. Every public entry point validates its input and
 * throws a {@link HexsalvageInputError} with one of these codes; nothing deeper in the engine
 * throws for numerical reasons (those are reported as data).
 */
export type InputErrorCode = 'netlist' | 'fault' | 'topology' | 'polarity' | 'option' | 'claims' | 'scenario' | 'usage';

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
  const raw = String(text);
  let esc = '';
  for (let i = 0; i < raw.length; i++) {
    const c = raw[i] as string;
    esc += invisibleUnit(raw.charCodeAt(i)) ? (named[c] ?? `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}`) : c;
  }
  return esc.length > max ? `${esc.slice(0, max - 3)}...` : esc;
}

// Characters a terminal would act on or that print as nothing: C0 and C1 controls, DEL, line and
// paragraph separators, bidirectional controls, zero-width and other invisible format characters
// (UTF-16 code-unit ranges, inclusive).
const INVISIBLE_RANGES: readonly (readonly [number, number])[] = [
  [0x0000, 0x001f],
  [0x007f, 0x009f],
  [0x00ad, 0x00ad],
  [0x034f, 0x034f],
  [0x061c, 0x061c],
  [0x115f, 0x1160],
  [0x17b4, 0x17b5],
  [0x180b, 0x180e],
  [0x200b, 0x200f],
  [0x2028, 0x202e],
  [0x2060, 0x206f],
  [0x3164, 0x3164],
  [0xfe00, 0xfe0f],
  [0xfeff, 0xfeff],
  [0xffa0, 0xffa0],
  [0xfff9, 0xfffb],
];

function invisibleUnit(code: number): boolean {
  return INVISIBLE_RANGES.some(([lo, hi]) => code >= lo && code <= hi);
}

/**
 * Whether a text holds a character a terminal would act on or that prints as nothing (controls,
 * bidirectional controls, zero-width characters): names in netlists may not.
 *
 * @param text - the text
 * @returns true when it holds one
 * @example
 * ```ts
 * hasInvisible('out\u200b'); // true
 * ```
 */
export function hasInvisible(text: string): boolean {
  for (let i = 0; i < text.length; i++) if (invisibleUnit(text.charCodeAt(i))) return true;
  return false;
}

/** A value read from a file, shown in messages by its kind only (messages never quote files). */
export class FileValue {
  /**
   * @param value - the value as read
   */
  constructor(readonly value: unknown) {}
}

/**
 * Wraps a value read from a file so that an error names its kind, never its content.
 *
 * @param v - the value
 * @returns the wrapped value for {@link HexsalvageInputError}'s `got`
 * @example
 * ```ts
 * new HexsalvageInputError('netlist', 'leg.json', 'devices[0].kind', 'igbt, mosfet or diode', fileValue('thyristor'));
 * // … got a text of 9 characters
 * ```
 */
export function fileValue(v: unknown): FileValue {
  return v instanceof FileValue ? v : new FileValue(v);
}

/** Short, single-line rendering of an offending value for error messages. */
function describeValue(v: unknown): string {
  if (v instanceof FileValue) {
    const x = v.value;
    if (typeof x === 'string') return `a text of ${x.length} character${x.length === 1 ? '' : 's'}`;
    if (typeof x === 'number') return 'a number';
    if (typeof x === 'boolean' || x === null) return String(x);
    if (Array.isArray(x)) return 'an array';
    return typeof x === 'object' ? 'an object' : typeof x;
  }
  if (typeof v === 'string')
    return `"${plainText(
      v.replace(/["\\]/g, (c) => `\\${c}`),
      60,
    )}"`;
  if (typeof v === 'number' || typeof v === 'boolean' || v === null) return String(v);
  if (Array.isArray(v)) return 'an array';
  return typeof v === 'object' ? 'an object' : typeof v;
}
