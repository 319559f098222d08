export { COMMAND_NAMES, loadCommand, main } from './main.js';
export type { Command } from './command.js';
export type { CommandIO } from './output/output.js';
