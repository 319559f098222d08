import type { OptionSpec, ParsedArgs } from './inputs/args.js';
import type { CommandIO } from './output/output.js';

/** One CLI command. */
export interface Command {
  readonly name: string;
  /** One line for the command list. */
  readonly summary: string;
  /** Usage line after `hexsalvage`. */
  readonly usage: string;
  readonly options: readonly OptionSpec[];
  /** How many positional arguments the command takes (default 0: options only). */
  readonly positionals?: number;
  /** Runs the command; resolves to the exit code. */
  readonly run: (args: ParsedArgs, io: CommandIO) => Promise<number>;
}

/** The rules of the safe limit, as every leg command takes them. */
export const RULE_OPTIONS: readonly OptionSpec[] = [
  { name: 'ignore-ratings', type: 'flag', help: 'skip the device voltage-rating check (reproduces the first version; unsafe)' },
  {
    name: 'level-steps',
    type: 'string',
    value: 'R',
    help: 'level changes a sequence may make: commutable (default), adjacent, or any (first version, unsafe)',
  },
];

/** Options shared by the commands that take a leg (with the rules of the limit). */
export const LEG_OPTIONS: readonly OptionSpec[] = [
  { name: 'topology', type: 'string', value: 'T', help: 'built-in leg (two-level, npc, anpc, anpc-hybrid, tnpc) or a netlist .json file' },
  {
    name: 'fault',
    type: 'list',
    value: 'F',
    help: "failed element PHASE.DEVICE[:open|short], e.g. a.outerUpper; the candidates of an ambiguous diagnosis joined by |, e.g. 'a.outerUpper|a.outerUpper.diode'; repeatable",
  },
  ...RULE_OPTIONS,
  {
    name: 'bypass',
    type: 'list',
    value: 'PHASE',
    help: 'tie that phase to the DC midpoint by a fitted bypass, every gate of it off (a leg with a DC node at 0)',
  },
];

/** The `--json` switch. */
export const VDC_OPTION: OptionSpec = {
  name: 'vdc',
  type: 'number',
  min: 0,
  openMin: true,
  max: 1e7,
  value: 'V',
  help: 'total DC-link voltage in volts: volts beside the per-unit figures',
};

export const JSON_OPTION: OptionSpec = { name: 'json', type: 'flag', help: 'print one JSON document instead of text' };
/** The `--help` switch. */
export const HELP_OPTION: OptionSpec = { name: 'help', type: 'flag', help: 'show this help' };
/** Load angle and polarity margin, as `plan` takes them. */
export const ANGLE_OPTIONS: readonly OptionSpec[] = [
  {
    name: 'load-angle',
    type: 'number',
    min: -180,
    max: 180,
    value: 'DEG',
    help: 'load angle phi in degrees, -180 to 180, currents lag the voltage (default 0)',
  },
  { name: 'polarity-margin', type: 'number', min: 0, max: 60, value: 'DEG', help: 'polarity margin delta in degrees, 0 <= delta < 60 (default 0)' },
];

/** The runtime's settings, as `table`, `export`, `cycle`, `simulate` and `report` take them. */
export const RUNTIME_OPTIONS: readonly OptionSpec[] = [
  {
    name: 'sequence',
    type: 'string',
    value: 'S',
    help: 'continuous (default: the centred seven-segment sequence) or discontinuous (one phase clamped per period)',
  },
  { name: 'balance', type: 'string', value: 'on|off', help: 'on (default): the redundant dwell split holds the midpoint; off: split equally' },
];
