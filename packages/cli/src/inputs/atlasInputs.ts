import { availableParallelism } from 'node:os';
import { FAULT_MODES, type FaultAtlas, type FaultMode } from '@hexsalvage/core';
import { assembleAtlas, atlasWork } from '@hexsalvage/core/internal';
import { degreeRange, usage, type OptionSpec, type ParsedArgs } from './args.js';
import { computeClasses } from '../atlas/atlasPool.js';
import { ruleInputs } from './legInputs.js';
import { loadTopology } from './loadTopology.js';
import type { CommandIO } from '../output/output.js';
import { progressLine } from '../output/progressLine.js';

/** The options that shape an atlas (`atlas`, `plot atlas`, `report --atlas`). */
export const ATLAS_OPTIONS: readonly OptionSpec[] = [
  { name: 'modes', type: 'string', value: 'M,M', help: 'atlas: fault modes to try for every element (default open,short)' },
  { name: 'load-angle-range', type: 'string', value: 'LO,HI', help: 'atlas: load-angle range in degrees, -180 <= LO <= HI <= 180 (default -90,90)' },
  { name: 'step', type: 'number', min: 0, openMin: true, max: 360, value: 'DEG', help: 'atlas: step of the mMax curve over the range (default 5)' },
  { name: 'pairs', type: 'flag', help: 'atlas: every unordered pair of faults in any phases instead of every single fault of phase a' },
  {
    name: 'jobs',
    type: 'number',
    min: 1,
    max: 256,
    integer: true,
    value: 'N',
    help: 'atlas: worker threads, at most the number of CPUs (default: that number, one for fewer than 400 fault classes); the result does not depend on it',
  },
  { name: 'force-jobs', type: 'flag', help: 'atlas: allow --jobs above the number of CPUs (each thread holds its own diagrams: memory grows with N)' },
];

/** Below this many classes the default is one thread: starting workers costs more than it saves. */
const SMALL_ATLAS = 400;

/**
 * Builds the atlas the command line asks for: topology, rules, modes, range, step, margin, pairs,
 * `--vdc`, on `--jobs` threads, with a progress line on a terminal.
 *
 * @param args - parsed arguments (with {@link ATLAS_OPTIONS}, `--topology`, the rule options)
 * @param io - output sinks (the progress line goes to stderr on a terminal)
 * @param quiet - no progress line (e.g. with `--json`)
 * @param withFaults - the command also takes `--fault` for its own part (the report); otherwise a
 *   `--fault` is refused, since the atlas tries every fault itself
 * @returns the atlas document
 * @example
 * ```ts
 * const atlas = await atlasFromArgs(args, io, false);
 * ```
 */
export async function atlasFromArgs(args: ParsedArgs, io: CommandIO, quiet: boolean, withFaults = false): Promise<FaultAtlas> {
  const t = args.values.get('topology');
  if (typeof t !== 'string') throw usage('--topology', 'a built-in leg id or a netlist file');
  if (!withFaults && (args.lists.get('fault') ?? []).length > 0) throw usage('--fault', 'no --fault with an atlas (it tries every fault itself)');
  const modesText = (args.values.get('modes') as string | undefined) ?? FAULT_MODES.join(',');
  const modes = modesText.split(',').map((m) => m.trim());
  if (modes.some((m) => !(FAULT_MODES as readonly string[]).includes(m)) || new Set(modes).size !== modes.length)
    throw usage('--modes', `a comma-separated list of distinct modes from ${FAULT_MODES.join(', ')}`, modesText);
  const range = degreeRange((args.values.get('load-angle-range') as string | undefined) ?? '-90,90', '--load-angle-range');
  const work = atlasWork({
    topology: loadTopology(t),
    modes: modes as FaultMode[],
    loadAngleRangeDeg: range as [number, number],
    stepDeg: args.values.get('step') as number | undefined,
    polarityMarginDeg: args.values.get('polarity-margin') as number | undefined,
    pairs: args.flags.has('pairs'),
    vdc: args.values.get('vdc') as number | undefined,
    ...ruleInputs(args),
  });
  const asked = args.values.get('jobs') as number | undefined;
  if (asked !== undefined && asked > availableParallelism() && !args.flags.has('force-jobs')) {
    throw usage('--jobs', `at most the number of CPUs here (${availableParallelism()}; --force-jobs allows more)`, asked);
  }
  const jobs = asked ?? (work.classes.length >= SMALL_ATLAS ? availableParallelism() : 1);
  const progress = progressLine(io, 'fault classes', !quiet);
  try {
    return assembleAtlas(work, await computeClasses(work, jobs, (d, n) => progress.update(d, n)));
  } finally {
    progress.end();
  }
}
