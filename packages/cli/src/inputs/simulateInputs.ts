import { existsSync } from 'node:fs';
import { HexsalvageInputError, type LegNetlist, type LevelStepRule, type SimulateOptions } from '@hexsalvage/core';
import { parseDeviceParameters } from '@hexsalvage/core/internal';
import { usage, type OptionSpec, type ParsedArgs } from './args.js';
import { runtimeInputs, updateInput } from './legInputs.js';
import { readJsonFile } from '@hexsalvage/core/node';

/** The options of one simulated period (`simulate`, `plot losses|spectrum|waveforms`). */
export const SIM_OPTIONS: readonly OptionSpec[] = [
  { name: 'm', type: 'number', min: 0, max: 10, value: 'M', help: 'modulation index (units of Vdc/2), at most mMax at the load angle' },
  { name: 'load-angle', type: 'number', min: -180, max: 180, value: 'DEG', help: 'load angle phi, degrees (currents lag the voltage)' },
  { name: 'polarity-margin', type: 'number', min: 0, max: 60, value: 'DEG', help: 'polarity margin delta in degrees, 0 <= delta < 60 (default 0)' },
  { name: 'vdc', type: 'number', min: 0, openMin: true, max: 1e7, value: 'V', help: 'total DC-link voltage, volts' },
  { name: 'current-peak', type: 'number', min: 0, openMin: true, max: 1e7, value: 'A', help: 'peak of the sinusoidal phase currents, amperes' },
  { name: 'f1', type: 'number', min: 0, openMin: true, max: 1e5, value: 'HZ', help: 'fundamental frequency, Hz' },
  {
    name: 'fsw',
    type: 'number',
    min: 0,
    openMin: true,
    max: 1e8,
    value: 'HZ',
    help: 'switching frequency, Hz (fsw/f1, rounded, periods per fundamental; at least 6)',
  },
  { name: 'devices', type: 'string', value: 'FILE', help: 'device loss parameters (docs/schema/devices.schema.json); default: invented demo values' },
  {
    name: 'capacitance',
    type: 'number',
    min: 0,
    openMin: true,
    max: 1e3,
    value: 'F',
    help: 'capacitance of each half of the DC link, farads (midpoint ripple in volts)',
  },
  { name: 'dead-time', type: 'number', min: 0, max: 1, value: 'S', help: 'dead time in seconds (default 0; at most a tenth of the switching period)' },
  { name: 'sequence', type: 'string', value: 'S', help: 'runtime sequence: continuous (default) or discontinuous' },
  { name: 'balance', type: 'string', value: 'on|off', help: 'runtime midpoint balance: on (default) or off' },
  { name: 'update', type: 'string', value: 'U', help: 'runtime sampling: half (default: at the carrier peak and valley) or period' },
];

/**
 * The simulation options the command line gives.
 *
 * @param args - parsed arguments with {@link SIM_OPTIONS}
 * @param topology - the leg
 * @param faults - the faults
 * @param rules - rating and level-step rules
 * @returns options for `simulatePeriod`
 * @example
 * ```ts
 * simulatePeriod(simulateInputs(args, topology, faults, rules));
 * ```
 */
export function simulateInputs(
  args: ParsedArgs,
  topology: string | LegNetlist,
  faults: readonly string[],
  rules: { ignoreRatings: boolean; levelSteps: LevelStepRule },
): SimulateOptions {
  const need = (k: string, what: string) => {
    const v = args.values.get(k);
    if (typeof v !== 'number') throw usage(`--${k}`, what);
    return v;
  };
  const file = args.values.get('devices') as string | undefined;
  let devices;
  if (file !== undefined) {
    if (!existsSync(file)) throw new HexsalvageInputError('option', file, '(file)', 'an existing device-parameter file');
    devices = parseDeviceParameters(readJsonFile(file, file, 'netlist'), file);
  }
  return {
    topology,
    faults,
    ...rules,
    m: need('m', 'the modulation index to run at'),
    loadAngleDeg: need('load-angle', 'the load angle in degrees'),
    polarityMarginDeg: (args.values.get('polarity-margin') as number | undefined) ?? 0,
    vdc: need('vdc', 'the DC-link voltage in volts'),
    currentPeak: need('current-peak', 'the peak phase current in amperes'),
    f1: need('f1', 'the fundamental frequency in Hz'),
    fsw: need('fsw', 'the switching frequency in Hz'),
    ...(devices ? { devices } : {}),
    ...(args.values.has('capacitance') ? { capacitance: args.values.get('capacitance') as number } : {}),
    ...(args.values.has('dead-time') ? { deadTime: deadTimeInput(args) } : {}),
    ...runtimeInputs(args),
    update: updateInput(args, 'half'),
  };
}

// The dead time: at most a tenth of the switching period (checked here so the line names the option).
function deadTimeInput(args: ParsedArgs): number {
  const td = args.values.get('dead-time') as number;
  const fsw = args.values.get('fsw');
  if (typeof fsw === 'number' && fsw > 0 && td > 0.1 / fsw)
    throw usage('--dead-time', `at most a tenth of the switching period (${(0.1 / fsw).toExponential(3)} s at ${fsw} Hz)`, td);
  return td;
}
