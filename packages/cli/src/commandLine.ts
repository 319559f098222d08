import { HexsalvageInputError } from '@hexsalvage/core/errors';
import type { OptionSpec, ParsedArgs } from './inputs/args.js';

/**
 * The command line as a user can type it again: the program, the command, its positionals, then
 * its options in the order the command lists them, values quoted for a POSIX shell where needed.
 *
 * @param command - the command name
 * @param specs - the command's options (their order)
 * @param args - the parsed arguments
 * @returns e.g. `hexsalvage report --scenario examples/pump-scenario.json --out review/pump-review.html`
 * @example
 * ```ts
 * commandLine('report', reportCommand.options, args);
 * ```
 */
export function commandLine(command: string, specs: readonly OptionSpec[], args: ParsedArgs): string {
  const q = (v: string) => (/^[\w@%+=:,./-]+$/.test(v) ? v : `'${v.replace(/'/g, `'\\''`)}'`);
  const parts = ['hexsalvage', command, ...args.positionals.map(q)];
  for (const s of specs) {
    if (s.type === 'flag' && args.flags.has(s.name)) parts.push(`--${s.name}`);
    else if (s.type === 'list') for (const v of args.lists.get(s.name) ?? []) parts.push(`--${s.name}`, q(v));
    else if (args.values.has(s.name)) parts.push(`--${s.name}`, q(String(args.values.get(s.name))));
  }
  return parts.join(' ');
}

/**
 * The time a document is made, ISO 8601 UTC to the second: `SOURCE_DATE_EPOCH` (seconds since 1970,
 * the reproducible-builds convention) when set, so that the same inputs give the same bytes.
 *
 * @param env - the environment (default `process.env`)
 * @returns e.g. `2026-12-02T14:00:00Z`
 * @example
 * ```ts
 * buildDate({ SOURCE_DATE_EPOCH: '0' }); // '1970-01-01T00:00:00Z'
 * ```
 */
export function buildDate(env: NodeJS.ProcessEnv = process.env): string {
  const e = env.SOURCE_DATE_EPOCH;
  if (e === undefined || e === '') return `${new Date().toISOString().slice(0, 19)}Z`;
  // whole seconds that a date can hold (up to the year 275760)
  if (!/^\d{1,15}$/.test(e) || Number(e) > 8.64e12)
    throw new HexsalvageInputError('usage', 'environment', 'SOURCE_DATE_EPOCH', 'whole seconds since 1970 (at most 8640000000000), or unset', e);
  return `${new Date(Number(e) * 1000).toISOString().slice(0, 19)}Z`;
}
