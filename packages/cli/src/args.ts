import { HexsalvageInputError } from '@hexsalvage/core';

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
}

/** Parsed command line of one command. */
export interface ParsedArgs {
  readonly positionals: readonly string[];
  readonly flags: ReadonlySet<string>;
  readonly values: ReadonlyMap<string, string | number>;
  readonly lists: ReadonlyMap<string, readonly string[]>;
}

/**
 * Parses `--name value`, `--name=value` and flags against a fixed option list.
 *
 * @param argv - arguments after the command name
 * @param specs - the command's options
 * @returns positionals and option values
 * @throws HexsalvageInputError (code `usage`) on unknown options, missing or non-numeric values
 * @example
 * ```ts
 * parseArgs(['--topology', 'npc', '--json'], specs);
 * ```
 */
export function parseArgs(argv: readonly string[], specs: readonly OptionSpec[]): ParsedArgs {
  const positionals: string[] = [];
  const flags = new Set<string>();
  const values = new Map<string, string | number>();
  const lists = new Map<string, string[]>();
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i] as string;
    if (!arg.startsWith('--') || arg === '--') {
      positionals.push(arg);
      continue;
    }
    const eq = arg.indexOf('=');
    const name = eq < 0 ? arg.slice(2) : arg.slice(2, eq);
    const spec = specs.find((s) => s.name === name);
    if (!spec) throw usage(`--${name}`, `one of ${specs.map((s) => `--${s.name}`).join(', ')}`, arg);
    if (spec.type === 'flag') {
      if (eq >= 0) throw usage(`--${name}`, 'no value (it is a switch)', arg.slice(eq + 1));
      flags.add(name);
      continue;
    }
    let raw: string | undefined = eq >= 0 ? arg.slice(eq + 1) : argv[++i];
    if (raw === undefined) throw usage(`--${name}`, `a value (${spec.value ?? 'text'})`);
    if (spec.type === 'number') {
      const n = raw.trim() === '' ? NaN : Number(raw);
      if (!Number.isFinite(n)) throw usage(`--${name}`, `a finite number (${spec.value ?? 'number'})`, raw);
      values.set(name, n);
    } else if (spec.type === 'list') {
      lists.set(name, [...(lists.get(name) ?? []), raw]);
    } else {
      if (values.has(name)) throw usage(`--${name}`, 'the option at most once', raw);
      values.set(name, raw);
    }
    raw = undefined;
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
