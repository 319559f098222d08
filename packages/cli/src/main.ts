import { HexsalvageInputError, plainText } from '@hexsalvage/core/errors';
import { parseArgs } from './inputs/args.js';
import type { Command } from './command.js';
import { OutputError, type CommandIO } from './output/output.js';
import { TOOL_VERSION } from './toolVersion.js';

// Commands are loaded only when they run (or when the full help lists them): `--version` and a
// usage error then start without loading the solver, the plots or the PNG renderer.
const LOADERS: Readonly<Record<string, () => Promise<Command>>> = {
  leg: async () => (await import('./commands/legCommand.js')).legCommand,
  vectors: async () => (await import('./commands/vectorsCommand.js')).vectorsCommand,
  plan: async () => (await import('./commands/planCommand.js')).planCommand,
  sweep: async () => (await import('./commands/sweepCommand.js')).sweepCommand,
  table: async () => (await import('./commands/tableCommand.js')).tableCommand,
  cycle: async () => (await import('./commands/cycleCommand.js')).cycleCommand,
  export: async () => (await import('./commands/exportCommand.js')).exportCommand,
  plot: async () => (await import('./commands/plotCommand.js')).plotCommand,
  report: async () => (await import('./commands/reportCommand.js')).reportCommand,
  check: async () => (await import('./commands/checkCommand.js')).checkCommand,
  atlas: async () => (await import('./commands/atlasCommand.js')).atlasCommand,
  simulate: async () => (await import('./commands/simulateCommand.js')).simulateCommand,
  switchover: async () => (await import('./commands/switchoverCommand.js')).switchoverCommand,
  explore: async () => (await import('./commands/exploreCommand.js')).exploreCommand,
};

/** Every command name, in the order `--help` lists them. */
export const COMMAND_NAMES: readonly string[] = Object.keys(LOADERS);

/**
 * Loads one command's module.
 *
 * @param name - a name from {@link COMMAND_NAMES}
 * @returns the command, or `undefined` for an unknown name
 * @example
 * ```ts
 * (await loadCommand('plan'))?.usage;
 * ```
 */
export async function loadCommand(name: string): Promise<Command | undefined> {
  return Object.prototype.hasOwnProperty.call(LOADERS, name) ? (LOADERS[name] as () => Promise<Command>)() : undefined;
}

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
    await io.stdout(`${await generalHelp()}\n`);
    return name === undefined ? 2 : 0;
  }
  if (name === '--version' || name === '-v') {
    await io.stdout(`hexsalvage ${TOOL_VERSION}\n`);
    return 0;
  }
  const cmd = await loadCommand(name);
  if (!cmd) {
    io.stderr(`hexsalvage: unknown command "${plainText(name, 40)}"; expected one of ${COMMAND_NAMES.join(', ')} (try --help)\n`);
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
    if (e instanceof RangeError && /string length/i.test(e.message)) {
      io.stderr(`hexsalvage ${cmd.name}: the document is too large to hold in memory as text: ask for less (one polarity, a smaller leg, fewer load angles)\n`);
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

async function generalHelp(): Promise<string> {
  const commands = await Promise.all(COMMAND_NAMES.map(async (n) => (await loadCommand(n)) as Command));
  return [
    `hexsalvage ${TOOL_VERSION}: what a three-phase converter leg can still do after a device (a switch or its diode) fails open or short`,
    '',
    'Usage: hexsalvage <command> [options]   (hexsalvage <command> --help for its options)',
    '',
    'Commands:',
    ...commands.map((c) => `  ${c.name.padEnd(9)} ${c.summary}`),
    '',
    'Units: potentials and modulation index in Vdc/2; angles in degrees.',
    'Caution: running with a failed device can overstress the remaining devices, the DC link and the load.',
  ].join('\n');
}

function commandHelp(c: Command): string {
  // a long option still keeps a space before its help
  const opts = c.options.map((o) => `${`  --${o.name}${o.value ? ` ${o.value}` : ''}`.padEnd(25)} ${o.help}`);
  return [`Usage: hexsalvage ${c.usage}`, '', c.summary, '', 'Options:', ...opts].join('\n');
}
