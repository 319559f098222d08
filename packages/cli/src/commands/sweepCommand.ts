import { CAUTIONS, describeRules, deratingCurve, lineRmsVolts, phasePeakVolts } from '@hexsalvage/core';
import { faultTexts, diagramAtlas } from '@hexsalvage/core/internal';
import { usage } from '../inputs/args.js';
import { HELP_OPTION, JSON_OPTION, LEG_OPTIONS, VDC_OPTION, type Command } from '../command.js';
import { cautionBlock, fmt, textTable } from '../format.js';
import { angleInputs, legInputs, vdcInput } from '../inputs/legInputs.js';

/** `hexsalvage sweep`: the derating curve mMax(φ). */
export const sweepCommand: Command = {
  name: 'sweep',
  summary: 'derating curve: exact maximum modulation index versus load angle, with breakpoints',
  usage: 'sweep --topology T [--fault F]... [--from DEG --to DEG --step DEG] [--polarity-margin DEG] [--vdc V] [--csv|--json]',
  options: [
    ...LEG_OPTIONS,
    { name: 'from', type: 'number', min: -180, max: 180, value: 'DEG', help: 'first load angle (default -90)' },
    { name: 'to', type: 'number', min: -180, max: 180, value: 'DEG', help: 'last load angle (default 90)' },
    { name: 'step', type: 'number', min: 0, openMin: true, max: 360, value: 'DEG', help: 'grid step (default 1)' },
    { name: 'polarity-margin', type: 'number', min: 0, max: 60, value: 'DEG', help: 'polarity margin delta in degrees, 0 <= delta < 60 (default 0)' },
    VDC_OPTION,
    {
      name: 'csv',
      type: 'flag',
      help: 'print CSV (load_angle_deg,m_max,derating_ratio,limiting_angle_deg,limiting_polarity,breakpoint,m_max_hull,derating_edge[,phase_peak_max_v,line_rms_max_v])',
    },
    JSON_OPTION,
    HELP_OPTION,
  ],
  run: async (args, io) => {
    const { topology, faults, rules } = legInputs(args);
    const { polarityMarginDeg } = angleInputs(args);
    const fromDeg = (args.values.get('from') as number | undefined) ?? -90;
    const toDeg = (args.values.get('to') as number | undefined) ?? 90;
    const stepDeg = (args.values.get('step') as number | undefined) ?? 1;
    if (fromDeg < -180 || fromDeg > 180) throw usage('--from', 'degrees in [-180, 180]', fromDeg);
    if (toDeg < fromDeg || toDeg > 180) throw usage('--to', `degrees in [${fromDeg}, 180]`, toDeg);
    if (!(stepDeg > 0) || (toDeg - fromDeg) / stepDeg > 100000) throw usage('--step', 'a positive step giving at most 100000 points', stepDeg);
    if (args.flags.has('csv') && args.flags.has('json')) throw usage('--csv', 'either --csv or --json, not both');
    const vdc = vdcInput(args);
    const atlas = diagramAtlas({ topology, faults, ...rules });
    const curve = deratingCurve(atlas, { fromDeg, toDeg, stepDeg, polarityMarginDeg });
    const points =
      vdc === undefined ? curve : curve.map((p) => ({ ...p, volts: { phasePeakMax: phasePeakVolts(p.mMax, vdc), lineRmsMax: lineRmsVolts(p.mMax, vdc) } }));
    if (args.flags.has('json')) {
      await io.stdout(
        `${JSON.stringify({ topology: atlas.analysis.topology, faults: faultTexts(atlas.analysis), polarityMarginDeg, rules: atlas.analysis.rules, ...(vdc === undefined ? {} : { vdc }), points })}\n`,
      );
      return 0;
    }
    if (args.flags.has('csv')) {
      const volts = (m: number) => (vdc === undefined ? [] : [phasePeakVolts(m, vdc).toFixed(3), lineRmsVolts(m, vdc).toFixed(3)]);
      const rows = points.map((p) =>
        [
          p.loadAngleDeg,
          p.mMax.toFixed(9),
          p.deratingRatio.toFixed(9),
          p.limitingAngleDeg.toFixed(6),
          p.limitingPolarity,
          p.breakpoint ? 1 : 0,
          p.mMaxHull.toFixed(9),
          p.deratingEdge ?? '',
          ...volts(p.mMax),
        ].join(','),
      );
      await io.stdout(
        `load_angle_deg,m_max,derating_ratio,limiting_angle_deg,limiting_polarity,breakpoint,m_max_hull,derating_edge${vdc === undefined ? '' : ',phase_peak_max_v,line_rms_max_v'}\n${rows.join('\n')}\n`,
      );
      return 0;
    }
    const stop = points.every((p) => p.mMax === 0)
      ? '\nThe drive cannot run in this state at any load angle of the range (mMax = 0 throughout): it must stop.\n'
      : points.some((p) => p.mMax === 0)
        ? '\nWhere mMax is 0 the drive cannot run in this state at that load angle.\n'
        : '';
    const mark = (p: (typeof points)[number]) => [p.breakpoint ? '*' : '', p.deratingEdge ? `derating ${p.deratingEdge}` : ''].filter(Boolean).join(' ');
    const rows = points.map((p) => [
      fmt(p.loadAngleDeg, 3),
      fmt(p.mMax, 5),
      ...(vdc === undefined ? [] : [fmt(lineRmsVolts(p.mMax, vdc), 1)]),
      fmt(p.deratingRatio, 4),
      fmt(p.mMaxHull, 5),
      fmt(p.limitingAngleDeg, 2),
      p.limitingPolarity,
      mark(p),
    ]);
    const head = `${vdc === undefined ? '' : `DC link ${fmt(vdc, 1)} V; "line V rms" = mMax as line-to-line RMS volts.\n`}Rules: ${describeRules(atlas.analysis.rules)}\nmMax is the safe limit; "hull" is the first version's convex-hull bound, shown for comparison (not safe by itself).\n\n`;
    await io.stdout(
      `${head}${textTable(['load deg', 'mMax', ...(vdc === undefined ? [] : ['line V rms']), 'ratio', 'hull', 'binds at', 'polarity', 'mark'], rows)}\n\n* = a kink of the curve (computed exactly; it may fall on a grid point); "derating begins/ends" = where, as the load angle grows, the limit leaves or returns to the healthy one${stop}${cautionBlock(CAUTIONS)}\n`,
    );
    return 0;
  },
};
