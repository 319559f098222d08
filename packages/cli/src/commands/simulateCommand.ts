import { CAUTIONS, simulatePeriod, simulationWaveform, type Simulation, type SimulateOptions } from '@hexsalvage/core';
import { csvCell, csvText } from '@hexsalvage/core/internal';
import { usage } from '../inputs/args.js';
import { HELP_OPTION, JSON_OPTION, LEG_OPTIONS, type Command } from '../command.js';
import { cautionBlock, fmt, textTable } from '../format.js';
import { legInputs } from '../inputs/legInputs.js';
import { writeFileAtomic } from '../output/output.js';
import { SIM_OPTIONS, simulateInputs } from '../inputs/simulateInputs.js';

/** `hexsalvage simulate`: one fundamental period, healthy and faulted side by side. */
export const simulateCommand: Command = {
  name: 'simulate',
  summary: 'one fundamental period of the degraded table: line-voltage spectrum, device currents and losses, midpoint swing',
  usage:
    'simulate --topology T [--fault F]... --m M --load-angle DEG --vdc V --current-peak A --f1 HZ --fsw HZ [--devices FILE.json] [--capacitance F] [--dead-time S] [--polarity-margin DEG] [--sequence S] [--balance on|off] [--update half|period] [--json|--csv] [--waveforms FILE.csv]',
  options: [
    ...LEG_OPTIONS,
    ...SIM_OPTIONS,
    { name: 'csv', type: 'flag', help: 'print the device table as CSV (faulted and healthy side by side)' },
    JSON_OPTION,
    {
      name: 'waveforms',
      type: 'string',
      value: 'FILE',
      help: 'also write one period as CSV: one row per piece (time, phase and line voltages, currents, midpoint voltage)',
    },
    HELP_OPTION,
  ],
  run: async (args, io) => {
    const { topology, faults, rules } = legInputs(args);
    if (args.flags.has('csv') && args.flags.has('json')) throw usage('--csv', 'either --csv or --json, not both');
    const options = simulateInputs(args, topology, faults, rules);
    const sim = simulatePeriod(options);
    const wave = args.values.get('waveforms') as string | undefined;
    if (wave !== undefined) {
      if (wave === '') throw usage('--waveforms', 'a CSV file path');
      await writeFileAtomic(wave, waveformCsv(options, sim));
    }
    if (args.flags.has('json')) await io.stdout(`${JSON.stringify(sim)}\n`);
    else if (args.flags.has('csv')) await io.stdout(deviceCsv(sim));
    else await io.stdout(`${simulationText(sim)}\n`);
    return 0;
  },
};

/**
 * The simulation as terminal text.
 *
 * @param s - from `simulatePeriod`
 * @returns text
 * @example
 * ```ts
 * simulationText(simulatePeriod(options));
 * ```
 */
export function simulationText(s: Simulation): string {
  const lv = (x: Simulation['lineVoltage']) => [
    fmt(x.fundamentalPeak, 1),
    fmt(x.fundamentalPeak / Math.SQRT2, 1),
    fmt(x.rms, 1),
    fmt(100 * x.thd, 2),
    fmt(100 * x.wthd, 3),
  ];
  const ids = Object.keys(s.devices);
  const total = (d: Simulation['devices'][string] | undefined) => (d ? d.conductionLoss + d.switchingLoss : 0);
  const rows = ids
    .filter((id) => total(s.devices[id]) > 1e-9 || total(s.healthy.devices[id]) > 1e-9)
    .map((id) => {
      const f = s.devices[id] as Simulation['devices'][string];
      const h = s.healthy.devices[id] as Simulation['devices'][string];
      const change = total(h) > 1e-9 ? `${fmt(100 * (total(f) / total(h) - 1), 0)} %` : total(f) > 1e-9 ? 'new' : '-';
      return [
        `${id}${f.failed ? ` (${f.failed.toUpperCase()})` : ''}`,
        fmt(f.avgCurrent, 1),
        fmt(f.rmsCurrent, 1),
        fmt(f.conductionLoss, 1),
        fmt(f.switchingLoss, 1),
        fmt(total(f), 1),
        fmt(total(h), 1),
        change,
      ];
    });
  const mid = (x: Simulation['midpoint']) =>
    x.chargePkPkAs === null
      ? 'no midpoint'
      : `ripple ${x.ripplePkPk === null ? '(give --capacitance for volts)' : `${fmt(x.ripplePkPk, 2)} V peak to peak`}, charge swing ${fmt(x.chargePkPkAs, 4)} As, average current into the midpoint ${fmt(x.averageCurrent ?? 0, 2)} A`;
  const d = s.currentDerating;
  return [
    `Leg: ${s.topology}   faults: ${s.faults.join(', ') || 'none'}   m = ${fmt(s.m, 4)}   load angle ${fmt(s.loadAngleDeg, 1)} deg`,
    `Vdc ${fmt(s.vdc, 1)} V, phase current ${fmt(s.currentPeak, 1)} A peak, f1 ${fmt(s.f1, 2)} Hz, fsw ${fmt(s.fsw, 0)} Hz (${s.periods} switching periods per fundamental). Devices: ${s.deviceParameters}.`,
    `Runtime: ${s.sequence} sequence, midpoint balance ${s.balance}, ${s.update === 'half' ? 'a sample at each half period' : 'one sample per period'}; ${s.deadTime > 0 ? `dead time ${fmt(s.deadTime * 1e6, 2)} us: during it each changing phase sits in the switches both states share and gives what the leg gives for its current's sign` : 'no dead time (ideal switching instants)'}.`,
    '',
    'Line voltage a-b:',
    textTable(
      ['leg', 'V1 peak', 'V1 rms', 'rms total', 'THD %', 'WTHD %'],
      [
        ['faulted', ...lv(s.lineVoltage)],
        ['healthy', ...lv(s.healthy.lineVoltage)],
      ],
    ),
    `(harmonics to order ${s.lineVoltage.harmonics.length}; THD and WTHD as in docs/simulate.md)`,
    '',
    'Device currents and losses over one fundamental period (faulted; healthy total beside):',
    textTable(['element', 'avg A', 'rms A', 'cond W', 'switch W', 'total W', 'healthy W', 'change'], rows),
    '',
    `Hottest element: ${s.hottest.device} ${fmt(s.hottest.loss, 1)} W (healthy leg: ${s.healthy.hottest.device} ${fmt(s.healthy.hottest.loss, 1)} W).`,
    `Current derating: at most ${fmt(100 * d.factor, 1)} % of ${fmt(s.currentPeak, 1)} A peak keeps every surviving element within the healthy leg's largest loss${d.limitingDevice ? ` (limited by ${d.limitingDevice})` : ''}; ${d.assumption}.`,
    ...(Object.values(s.devices).some((x) => x.failed === 'short')
      ? [
          'A shorted element still carries current: its conduction loss above is indicative (its parameters as if healthy); it is never charged switching loss nor named as limiting.',
        ]
      : []),
    ...(s.runtime.heldPeriods
      ? [
          `HELD ${s.runtime.heldPeriods} UPDATES: the runtime found no safe step into the triangle the reference needed and kept its state (the voltage above is not the one asked for).`,
        ]
      : []),
    ...(s.interruptedTime > 0
      ? [
          `WARNING: for ${fmt(s.interruptedTime * 1e6, 1)} us (phase-seconds) a phase's state offered no path for its current's actual sign: the current would be interrupted. Use a polarity margin.`,
        ]
      : []),
    `Midpoint: faulted ${mid(s.midpoint)}; healthy ${mid(s.healthy.midpoint)}.`,
    ...(s.lineDevicesAtPwm.length
      ? [`LINE-FREQUENCY DEVICES SWITCHED AT PWM RATE: ${s.lineDevicesAtPwm.map((x) => `${x.device} (${fmt(x.switchingLoss, 1)} W switching)`).join(', ')}.`]
      : []),
    ...(s.wrongSignTime > 0
      ? [
          `WARNING: for ${fmt(s.wrongSignTime * 1e6, 1)} us (phase-seconds) a phase current had the other sign than the polarity its switching period was planned for, and its state gave another level than planned: use a polarity margin (--polarity-margin).`,
        ]
      : []),
    'Losses use the loss model of docs/simulate.md (threshold voltage and slope resistance, on-resistance for MOSFETs, switching energies scaled with voltage and current).',
    cautionBlock(CAUTIONS),
  ].join('\n');
}

function deviceCsv(s: Simulation): string {
  const head =
    'element,avg_current_a,rms_current_a,conduction_loss_w,switching_loss_w,healthy_avg_current_a,healthy_rms_current_a,healthy_conduction_loss_w,healthy_switching_loss_w';
  const rows = Object.entries(s.devices).map(([id, d]) => {
    const h = s.healthy.devices[id] as Simulation['devices'][string];
    return [csvCell(csvText(id)), d.avgCurrent, d.rmsCurrent, d.conductionLoss, d.switchingLoss, h.avgCurrent, h.rmsCurrent, h.conductionLoss, h.switchingLoss]
      .map((v) => (typeof v === 'number' ? v.toFixed(6) : v))
      .join(',');
  });
  return `${head}\n${rows.join('\n')}\n`;
}

function waveformCsv(options: SimulateOptions, s: Simulation): string {
  const seg = simulationWaveform(options);
  const w = 2 * Math.PI * s.f1;
  const phi = (s.loadAngleDeg * Math.PI) / 180;
  const i = (k: number, t: number) => s.currentPeak * Math.cos(w * t - phi - (k * 2 * Math.PI) / 3);
  const rows = seg.map((g) => {
    const [va, vb, vc] = g.phaseVolts;
    return [g.t0, va, vb, vc, va - vb, vb - vc, vc - va, i(0, g.t0), i(1, g.t0), i(2, g.t0), g.midpointVolts].map((v) => Number(v.toPrecision(12))).join(',');
  });
  return `time_s,va_v,vb_v,vc_v,vab_v,vbc_v,vca_v,ia_a,ib_a,ic_a,vmid_v\n${rows.join('\n')}\n`;
}
