import { CAUTIONS, cycleCheck, lineRmsVolts, phasePeakVolts } from '@hexsalvage/core';
import { diagramAtlas, planFromAtlas, switchingTableFromAtlas } from '@hexsalvage/core/internal';
import { usage } from '../inputs/args.js';
import { ANGLE_OPTIONS, HELP_OPTION, JSON_OPTION, LEG_OPTIONS, RUNTIME_OPTIONS, VDC_OPTION, type Command } from '../command.js';
import { cautionBlock, fmt, textTable, voltsText } from '../format.js';
import { angleInputs, legInputs, runtimeInputs, updateInput, vdcInput } from '../inputs/legInputs.js';

/** `hexsalvage cycle`: run the runtime through one fundamental period. */
export const cycleCommand: Command = {
  name: 'cycle',
  summary: 'run the runtime through one fundamental period: steps, volt-seconds, midpoint, gate changes',
  usage:
    'cycle --topology T [--fault F]... --m M [--load-angle DEG] [--polarity-margin DEG] [--ratio N] [--current A] [--sequence S] [--balance on|off] [--update period|half] [--stream] [--vdc V] [--json]',
  options: [
    ...LEG_OPTIONS,
    ...ANGLE_OPTIONS,
    { name: 'm', type: 'number', min: 0, max: 10, value: 'M', help: 'modulation index to run at (units of Vdc/2), at most the mMax of the plan' },
    { name: 'ratio', type: 'number', min: 6, max: 20000, integer: true, value: 'N', help: 'switching periods per fundamental period, fsw/f1 (default 120)' },
    { name: 'current', type: 'number', min: 0, openMin: true, max: 1e9, value: 'A', help: 'peak phase current (default 1: results per unit of current)' },
    ...RUNTIME_OPTIONS,
    { name: 'update', type: 'string', value: 'U', help: 'period (default: one sample per switching period) or half (a sample at each half)' },
    { name: 'stream', type: 'flag', help: 'with --json: every segment of the period ("stream")' },
    VDC_OPTION,
    JSON_OPTION,
    HELP_OPTION,
  ],
  run: async (args, io) => {
    const { topology, faults, rules } = legInputs(args);
    const { loadAngleDeg, polarityMarginDeg } = angleInputs(args);
    const runtime = runtimeInputs(args);
    const update = updateInput(args, 'period');
    const vdc = vdcInput(args);
    const m = args.values.get('m');
    if (typeof m !== 'number') throw usage('--m', 'the modulation index to run at');
    if (args.flags.has('stream') && !args.flags.has('json')) throw usage('--stream', 'used with --json (the stream is a JSON array)');
    const atlas = diagramAtlas({ topology, faults, ...rules });
    const plan = planFromAtlas(atlas, loadAngleDeg, polarityMarginDeg);
    if (plan.mMax === 0) throw usage('--m', 'nothing: the drive cannot run in this state (mMax = 0 at this load angle)', m);
    if (m > plan.mMax + 1e-12) throw usage('--m', `at most mMax = ${fmt(plan.mMax, 6)} at this load angle (the reference would be clamped)`, m);
    const report = cycleCheck(switchingTableFromAtlas(atlas), {
      m,
      loadAngleDeg,
      polarityMarginDeg,
      update,
      ...runtime,
      frequencyRatio: (args.values.get('ratio') as number | undefined) ?? 120,
      currentAmplitude: (args.values.get('current') as number | undefined) ?? 1,
      stream: args.flags.has('stream'),
    });
    if (args.flags.has('json')) {
      await io.stdout(
        `${JSON.stringify({ topology: plan.topology, faults: plan.faults, m, loadAngleDeg, polarityMarginDeg, mMax: plan.mMax, mMaxBalanced: plan.mMaxBalanced, rules: plan.rules, ...(vdc === undefined ? {} : { volts: { vdc, phasePeak: phasePeakVolts(m, vdc), lineRms: lineRmsVolts(m, vdc), phasePeakMax: phasePeakVolts(plan.mMax, vdc), lineRmsMax: lineRmsVolts(plan.mMax, vdc) } }), ...report })}\n`,
      );
      return 0;
    }
    const rows = Object.entries(report.gateChangesPerCycle).map(([dev, c]) => [dev, String(c)]);
    const mc = report.midpointCurrent;
    await io.stdout(
      `${[
        `Leg: ${plan.topology}   faults: ${plan.faults.join(', ') || 'none'}   m = ${fmt(m, 4)} (mMax ${fmt(plan.mMax, 4)}, mMaxBalanced ${fmt(plan.mMaxBalanced, 4)})   load angle ${fmt(loadAngleDeg, 1)} deg`,
        ...(vdc === undefined ? [] : [`At Vdc = ${fmt(vdc, 1)} V: m${voltsText(m, vdc)}; mMax${voltsText(plan.mMax, vdc)}`]),
        `Runtime: ${report.sequence} sequence, midpoint balance ${report.balance}, ${report.update === 'half' ? 'a sample at each half period' : 'one sample per period'}; ${report.periods} switching periods per fundamental`,
        `Steps: ${report.multiPhaseSteps === 0 ? 'every step changes one phase by an allowed move' : `${report.multiPhaseSteps} steps change two or more phases at once`}${report.chainSteps ? `; ${report.chainSteps} states inserted to chain periods` : ''}`,
        ...(report.heldPeriods
          ? [
              `HELD ${report.heldPeriods} PERIODS: no safe step led from the present state into the triangle the reference needed, so the runtime kept its state and did not follow the reference. Do not run at this operating point with this table.`,
            ]
          : []),
        `Volt-second balance: largest error ${report.voltSecondErrorMax.toExponential(2)} x Vdc/2${report.clampedPeriods ? `; ${report.clampedPeriods} periods clamped` : ''}`,
        `Average current into the midpoint: ${fmt(mc.runtime, 5)} from the runtime${mc.reachable ? ` (reachable ${fmt(mc.reachable[0], 5)} ... ${fmt(mc.reachable[1], 5)})` : ''}`,
        report.midpointDrift
          ? `MIDPOINT WOULD DRIFT: no split of the redundant states balances it over the cycle (zero average is reachable only up to m = ${fmt(plan.mMaxBalanced, 4)}).`
          : report.runtimeDrift
            ? 'MIDPOINT DRIFTS with this runtime setting (balance off, or the discontinuous sequence): the average above is not zero.'
            : 'Midpoint: balanced.',
        '',
        'Gate changes per fundamental period:',
        textTable(['device', 'changes'], rows),
        cautionBlock(CAUTIONS),
      ].join('\n')}\n`,
    );
    return 0;
  },
};
