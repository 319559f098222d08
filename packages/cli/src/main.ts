import { readFileSync } from 'node:fs';
import { HexsalvageInputError } from '@hexsalvage/core';
import { parseArgs } from './args.js';
import type { Command } from './command.js';
import { legCommand } from './commands/legCommand.js';
import { planCommand } from './commands/planCommand.js';
import { sweepCommand } from './commands/sweepCommand.js';
import { vectorsCommand } from './commands/vectorsCommand.js';
import { tableCommand } from './commands/tableCommand.js';
import { exportCommand } from './commands/exportCommand.js';
import { plotCommand } from './commands/plotCommand.js';
import { checkCommand } from './commands/checkCommand.js';
import { reportCommand } from './commands/reportCommand.js';
import { cycleCommand } from './commands/cycleCommand.js';
import { OutputError, type CommandIO } from './output.js';

/** Every command, in the order `--help` lists them. */
export const COMMANDS: readonly Command[] = [legCommand, vectorsCommand, planCommand, sweepCommand, tableCommand, cycleCommand, exportCommand, plotCommand, reportCommand, checkCommand];

const VERSION = (JSON.parse(readFileSync(new URL('../package.json', import.meta.url), 'utf8')) as { version: string }).version;

/**
 * Runs the CLI.
 *
 * @param argv - arguments after the program name
 * @param io - output sinks
 * @returns the exit code: 0 done, 1 a check failed, 2 bad input, 70 internal error, 74 output not writable
 * @example
 * ```ts
 * process.exitCode = await main(process.argv.slice(2), io);
 * ```
 */
export async function main(argv: readonly string[], io: CommandIO): Promise<number> {
  const [name, ...rest] = argv;
  if (name === undefined || name === '--help' || name === '-h' || name === 'help') {
    await io.stdout(`${generalHelp()}\n`);
    return name === undefined ? 2 : 0;
  }
  if (name === '--version' || name === '-v') {
    await io.stdout(`hexsalvage ${VERSION}\n`);
    return 0;
  }
  const cmd = COMMANDS.find((c) => c.name === name);
  if (!cmd) {
    io.stderr(`hexsalvage: unknown command "${name}"; expected one of ${COMMANDS.map((c) => c.name).join(', ')} (try --help)\n`);
    return 2;
  }
  try {
    const args = parseArgs(rest, cmd.options, cmd.positionals ?? 0);
    if (args.flags.has('help')) {
      await io.stdout(`${commandHelp(cmd)}\n`);
      return 0;
    }
    return await cmd.run(args, io);
  } catch (e) {
    if (e instanceof HexsalvageInputError) {
      io.stderr(`hexsalvage ${cmd.name}: ${e.message}\n`);
      return 2;
    }
    if (e instanceof OutputError) {
      io.stderr(`hexsalvage ${cmd.name}: ${e.message}\n`);
      return 74;
    }
    io.stderr(`hexsalvage ${cmd.name}: internal error: ${String((e as Error)?.message ?? e).split('\n')[0]}\n`);
    return 70;
  }
}

function generalHelp(): string {
  return [
    `hexsalvage ${VERSION}: what a three-phase converter leg can still do after a device fails open`,
    '',
    'Usage: hexsalvage <command> [options]   (hexsalvage <command> --help for its options)',
    '',
    'Commands:',
    ...COMMANDS.map((c) => `  ${c.name.padEnd(9)} ${c.summary}`),
    '',
    'Units: potentials and modulation index in Vdc/2; angles in degrees.',
    'Caution: running with a failed device can overstress the remaining devices, the DC link and the load.',
  ].join('\n');
}

function commandHelp(c: Command): string {
  const opts = c.options.map((o) => `  --${o.name}${o.value ? ` ${o.value}` : ''}`.padEnd(26) + o.help);
  return [`Usage: hexsalvage ${c.usage}`, '', c.summary, '', 'Options:', ...opts].join('\n');
}
