import { HexsalvageInputError } from '@hexsalvage/core/errors';

/** How one command-line option is read. */
export interface OptionSpec {
  /** Long name without dashes, e.g. `load-angle`. */
  readonly name: string;
  /** `flag`: no value; `string`/`number`: one value; `list`: repeatable string. */
  readonly type: 'flag' | 'string' | 'number' | 'list';
  /** One line for `--help`. */
  readonly help: string;
  /** Placeholder for the value in `--help`, e.g. `DEG`. */
  readonly value?: string;
  /** `number` options: the accepted range (inclusive unless `openMin`), and whether only integers. */
  readonly min?: number;
  readonly max?: number;
  readonly openMin?: boolean;
  readonly integer?: boolean;
}

/** Parsed command line of one command. */
export interface ParsedArgs {
  readonly positionals: readonly string[];
  readonly flags: ReadonlySet<string>;
  readonly values: ReadonlyMap<string, string | number>;
  readonly lists: ReadonlyMap<string, readonly string[]>;
}

// A decimal number, with an optional exponent: no hexadecimal, binary, octal, Infinity or NaN,
// so that what a user types means what it reads as.
const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/**
 * Parses `--name value`, `--name=value` and flags against a fixed option list.
 *
 * Strict: an unknown option (or a single-dash one), a value-taking option given twice (only `list`
 * options repeat), a number that is not plain decimal, and more positional arguments than the
 * command takes are usage errors.
 *
 * @param argv - arguments after the command name
 * @param specs - the command's options
 * @param maxPositionals - how many positional arguments the command takes (default 0)
 * @returns positionals and option values
 * @throws HexsalvageInputError (code `usage`) on unknown options, repeats, missing or non-decimal values, stray words
 * @example
 * ```ts
 * parseArgs(['--topology', 'npc', '--json'], specs);
 * ```
 */
export function parseArgs(argv: readonly string[], specs: readonly OptionSpec[], maxPositionals = 0): ParsedArgs {
  const positionals: string[] = [];
  const flags = new Set<string>();
  const values = new Map<string, string | number>();
  const lists = new Map<string, string[]>();
  const known = new Map(specs.map((s) => [s.name, s] as const));
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i] as string;
    if (arg.startsWith('-') && arg !== '-' && !arg.startsWith('--') && !DECIMAL.test(arg)) {
      throw usage(arg, `an option of the form --name (one of ${specs.map((s) => `--${s.name}`).join(', ')})`, arg);
    }
    if (!arg.startsWith('--') || arg === '--') {
      if (positionals.length >= maxPositionals) {
        throw usage(
          'arguments',
          maxPositionals === 0 ? 'options only (no stray words)' : `at most ${maxPositionals} argument${maxPositionals > 1 ? 's' : ''} besides the options`,
          arg,
        );
      }
      positionals.push(arg);
      continue;
    }
    const eq = arg.indexOf('=');
    const name = eq < 0 ? arg.slice(2) : arg.slice(2, eq);
    const spec = known.get(name);
    if (!spec) throw usage(`--${name}`, `one of ${specs.map((s) => `--${s.name}`).join(', ')}`, arg);
    if (spec.type === 'flag') {
      if (eq >= 0) throw usage(`--${name}`, 'no value (it is a switch)', arg.slice(eq + 1));
      if (flags.has(name)) throw usage(`--${name}`, 'the switch at most once', arg);
      flags.add(name);
      continue;
    }
    const raw: string | undefined = eq >= 0 ? arg.slice(eq + 1) : argv[++i];
    if (raw === undefined) throw usage(`--${name}`, `a value (${spec.value ?? 'text'})`);
    if (spec.type === 'list') {
      lists.set(name, [...(lists.get(name) ?? []), raw]);
      continue;
    }
    if (values.has(name)) throw usage(`--${name}`, 'the option at most once (it is not repeatable)', raw);
    if (spec.type === 'number') {
      const n = DECIMAL.test(raw.trim()) ? Number(raw) : NaN;
      if (!Number.isFinite(n)) throw usage(`--${name}`, `a decimal number (${spec.value ?? 'number'}), e.g. 12.5 or -3e-2`, raw);
      const lo = spec.min ?? -Infinity;
      const hi = spec.max ?? Infinity;
      const inRange = (spec.openMin ? n > lo : n >= lo) && n <= hi && (!spec.integer || Number.isInteger(n));
      if (!inRange) throw usage(`--${name}`, `${spec.integer ? 'a whole number' : 'a number'} ${spec.openMin ? `above ${lo}` : `from ${lo}`} to ${hi}`, raw);
      values.set(name, n);
    } else {
      values.set(name, raw);
    }
  }
  return { positionals, flags, values, lists };
}

/**
 * A usage error for the command line.
 *
 * @param key - the option or argument
 * @param expected - what was expected
 * @param got - what was given
 * @returns the error to throw
 * @example
 * ```ts
 * throw usage('--polarity', 'three of +, - or ?', 'abc');
 * ```
 */
export function usage(key: string, expected: string, got?: unknown): HexsalvageInputError {
  return new HexsalvageInputError('usage', 'command line', key, expected, got);
}

/**
 * A load-angle range option `LO,HI` (degrees, plain decimals, −180 ≤ LO ≤ HI ≤ 180).
 *
 * @param text - the option's value
 * @param key - the option, e.g. `--load-angle-range`
 * @returns [LO, HI]
 * @throws HexsalvageInputError (usage) naming the option
 * @example
 * ```ts
 * degreeRange('-90,90', '--load-angle-range'); // [-90, 90]
 * ```
 */
export function degreeRange(text: string, key: string): [number, number] {
  const parts = text.split(',').map((x) => x.trim());
  const r = parts.map((x) => (DECIMAL.test(x) ? Number(x) : NaN));
  const [lo, hi] = r as [number, number];
  if (r.length !== 2 || !r.every(Number.isFinite) || lo < -180 || hi > 180 || lo > hi)
    throw usage(key, 'LO,HI in degrees with -180 <= LO <= HI <= 180, e.g. -90,90', text);
  return [lo, hi];
}
