import {
  parsePolarity,
  simulatePeriod,
  simulationWaveform,
  deratingCurve,
  samplePeriod,
  type DiagramAtlas,
  type RemedialPlan,
  type SequenceMode,
} from '@hexsalvage/core';
import { faultTexts, diagramAtlas, gatedDeviceIds, planFromAtlas, switchingTableFromAtlas } from '@hexsalvage/core/internal';
import {
  atlasHeatmapSvg,
  atlasPairMatrixSvg,
  deratingCurveSvg,
  legSchematicSvg,
  lossBarsSvg,
  spectrumSvg,
  waveformsSvg,
  sectorOverviewSvg,
  switchingPeriodSvg,
  vectorDiagramSvg,
} from '@hexsalvage/plot';
import { degreeRange, usage } from '../inputs/args.js';
import { SIM_OPTIONS, simulateInputs } from '../inputs/simulateInputs.js';
import { ATLAS_OPTIONS, atlasFromArgs } from '../inputs/atlasInputs.js';
import { ANGLE_OPTIONS, HELP_OPTION, LEG_OPTIONS, VDC_OPTION, type Command } from '../command.js';
import { angleInputs, legInputs, runtimeInputs, vdcInput } from '../inputs/legInputs.js';
import { writeSvgOrPng } from '../output/renderFile.js';
import { schematicFocus } from '../schematicFocus.js';

const KINDS = ['diagram', 'sectors', 'derating', 'leg', 'sequence', 'atlas', 'losses', 'spectrum', 'waveforms'] as const;

/** `hexsalvage plot`: review pictures as SVG or PNG. */
export const plotCommand: Command = {
  name: 'plot',
  summary: 'draw a review picture: diagram, sectors, derating, leg, sequence, atlas, losses, spectrum or waveforms (SVG or PNG)',
  usage:
    'plot diagram|sectors|derating|leg|sequence|atlas|losses|spectrum|waveforms --topology T [--fault F]... [--load-angle DEG] [--polarity XYZ] [atlas options] --out FILE.svg|.png',
  positionals: 1,
  options: [
    ...LEG_OPTIONS,
    ...ANGLE_OPTIONS,
    { name: 'polarity', type: 'string', value: 'XYZ', help: 'diagram/sequence: polarity string (default: where the limit binds)' },
    { name: 'm', type: 'number', min: 0, max: 10, value: 'M', help: 'diagram: also draw a reference circle at this modulation index' },
    { name: 'compare', type: 'list', value: 'F,F', help: 'derating: another fault case to overlay (comma-separated faults); repeatable' },
    { name: 'phase', type: 'string', value: 'a|b|c', help: 'leg: phase to draw (default: the first faulted phase)' },
    { name: 'pattern', type: 'string', value: 'NAME', help: 'leg: gate pattern whose conduction path is drawn (default: the first one a fault changes)' },
    { name: 'sign', type: 'string', value: '+|-', help: 'leg: current sign of the drawn path (default +)' },
    {
      name: 'triangle',
      type: 'number',
      min: 0,
      max: 100000,
      integer: true,
      value: 'N',
      help: 'sequence: triangle index (default: the one at 0.7 mMax where the limit binds)',
    },
    ...ATLAS_OPTIONS,
    VDC_OPTION,
    ...SIM_OPTIONS.filter((o) => !['m', 'load-angle', 'polarity-margin', 'vdc'].includes(o.name)),
    { name: 'log', type: 'flag', help: 'spectrum: logarithmic amplitude axis' },
    { name: 'out', type: 'string', value: 'FILE', help: 'output file, .svg or .png' },
    HELP_OPTION,
  ],
  run: async (args, io) => {
    const kind = args.positionals[0];
    if (!KINDS.includes(kind as (typeof KINDS)[number])) throw usage('KIND', `one of ${KINDS.join(', ')}`, kind);
    const out = args.values.get('out');
    if (typeof out !== 'string' || !/\.(svg|png)$/.test(out)) throw usage('--out', 'a file name ending in .svg or .png', out);
    if (kind === 'losses' || kind === 'spectrum' || kind === 'waveforms') {
      // one simulated period (see simulate): --m, --load-angle, --vdc, --current-peak, --f1, --fsw
      const { topology: tp, faults: fs, rules: rl } = legInputs(args);
      const options = simulateInputs(args, tp, fs, rl);
      const sim = simulatePeriod(options);
      const svgSim =
        kind === 'losses'
          ? lossBarsSvg(sim)
          : kind === 'spectrum'
            ? spectrumSvg(sim, { log: args.flags.has('log') })
            : waveformsSvg(sim, simulationWaveform(options));
      const bytes = await writeSvgOrPng(out, svgSim);
      await io.stdout(`wrote ${out} (${kind}, ${bytes} bytes)\n`);
      return 0;
    }
    if (kind === 'atlas') {
      // a heat map of every single fault, or the fault × fault matrix with --pairs
      const atlas = await atlasFromArgs(args, io, false);
      const bytes = await writeSvgOrPng(out, atlas.pairs ? atlasPairMatrixSvg(atlas) : atlasHeatmapSvg(atlas));
      await io.stdout(`wrote ${out} (atlas, ${bytes} bytes)\n`);
      return 0;
    }
    const { topology, faults, rules } = legInputs(args);
    const { loadAngleDeg, polarityMarginDeg } = angleInputs(args);
    const atlas = diagramAtlas({ topology, faults, ...rules });
    const plan = planFromAtlas(atlas, loadAngleDeg, polarityMarginDeg);
    const polarity = (args.values.get('polarity') as string | undefined) ?? plan.limitingPolarity;
    parsePolarity(polarity, '--polarity');
    let svg: string;
    if (kind === 'diagram') {
      const vdcD = vdcInput(args);
      svg = vectorDiagramSvg(plan, polarity, { referenceM: args.values.get('m') as number | undefined, ...(vdcD !== undefined ? { vdc: vdcD } : {}) });
    } else if (kind === 'sectors') {
      svg = sectorOverviewSvg(plan);
    } else if (kind === 'derating') {
      const label = faultTexts(atlas.analysis).join(', ') || 'healthy';
      const series = [{ label, points: deratingCurve(atlas, { stepDeg: 1, polarityMarginDeg }) }];
      for (const c of args.lists.get('compare') ?? []) {
        const f = c
          .split(',')
          .map((x) => x.trim())
          .filter(Boolean);
        const a = diagramAtlas({ topology, faults: f, ...rules });
        // the label as the CLI writes faults (with the mode), so that open and short read apart
        series.push({ label: faultTexts(a.analysis).join(', ') || 'healthy', points: deratingCurve(a, { stepDeg: 1, polarityMarginDeg }) });
      }
      const band = args.values.get('load-angle-range') as string | undefined;
      const b = band === undefined ? undefined : degreeRange(band, '--load-angle-range');
      const vdc = vdcInput(args);
      svg = deratingCurveSvg(series, {
        healthy: plan.mMaxHealthy,
        title: `Maximum modulation index versus load angle: ${atlas.analysis.topology}`,
        ...(args.values.has('load-angle') ? { operatingDeg: loadAngleDeg } : {}),
        ...(b ? { bandDeg: b } : {}),
        ...(vdc !== undefined ? { vdc } : {}),
      });
    } else if (kind === 'leg') {
      svg = legSchematicSvg(
        atlas.analysis.leg,
        schematicFocus(
          atlas.analysis,
          args.values.get('phase') as string | undefined,
          args.values.get('pattern') as string | undefined,
          args.values.get('sign') as string | undefined,
        ),
      );
    } else {
      svg = sequencePicture(atlas, plan, polarity, args.values.get('triangle') as number | undefined, runtimeInputs(args));
    }
    const bytes = await writeSvgOrPng(out, svg);
    await io.stdout(`wrote ${out} (${kind}, ${bytes} bytes)\n`);
    return 0;
  },
};

/**
 * The switching period the runtime applies in one triangle: by default at 0.7·mMax where the limit
 * binds (0.7 of the healthy limit where the leg cannot run), or at the centroid of `--triangle`.
 *
 * @param atlas - the leg's diagrams
 * @param plan - its plan at the load angle
 * @param polarity - the polarity string drawn
 * @param triangle - a triangle index of that polarity, or undefined
 * @param runtime - the runtime's sequence and balance
 * @returns the SVG
 * @throws HexsalvageInputError for a triangle index out of range
 */
export function sequencePicture(
  atlas: DiagramAtlas,
  plan: RemedialPlan,
  polarity: string,
  triangle: number | undefined,
  runtime: { sequence: SequenceMode; balance: 'on' | 'off' },
): string {
  const table = switchingTableFromAtlas(atlas);
  const entry = table.polarities[polarity]!;
  let alpha: number;
  let beta: number;
  if (triangle === undefined) {
    const th = (plan.limitingAngleDeg * Math.PI) / 180;
    const r = 0.7 * (plan.mMax > 0 ? plan.mMax : plan.mMaxHealthy);
    [alpha, beta] = [r * Math.cos(th), r * Math.sin(th)];
  } else {
    if (!Number.isInteger(triangle) || triangle < 0 || triangle >= entry.tableTriangles.length)
      throw usage('--triangle', `a triangle index 0…${entry.tableTriangles.length - 1} of polarity ${polarity}`, triangle);
    const v = entry.tableTriangles[triangle]!.vertices;
    [alpha, beta] = [(v[0].alpha + v[1].alpha + v[2].alpha) / 3, (v[0].beta + v[1].beta + v[2].beta) / 3];
  }
  const period = samplePeriod(table, { alpha, beta, polarity, ...runtime });
  return switchingPeriodSvg(period, {
    switches: gatedDeviceIds(atlas.analysis.leg),
    levels: table.levels,
    lineDevices: table.lineDevices,
    title: `Switching period: ${atlas.analysis.topology}, polarity ${polarity}, triangle ${period.triangle}`,
  });
}
