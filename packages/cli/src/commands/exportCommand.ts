import { deratingSteps, exportC, exportCsv, exportDocument } from '@hexsalvage/core';
import { diagramAtlas, planFromAtlas, switchingTableFromAtlas, withVolts } from '@hexsalvage/core/internal';
import { usage } from '../inputs/args.js';
import { ANGLE_OPTIONS, HELP_OPTION, LEG_OPTIONS, RUNTIME_OPTIONS, VDC_OPTION, type Command } from '../command.js';
import { angleInputs, legInputs, runtimeInputs, vdcInput } from '../inputs/legInputs.js';
import { writeFileAtomic } from '../output/output.js';

const FORMATS = ['json', 'csv', 'c'] as const;

/** `hexsalvage export`: the table (and plan) as JSON, CSV or a C header. */
export const exportCommand: Command = {
  name: 'export',
  summary: 'write the plan and switching table as JSON, CSV or a C header for firmware',
  usage:
    'export --format json|csv|c --out FILE --topology T [--fault F]... [--load-angle DEG] [--polarity-margin DEG] [--prefix ID] [--c-type double|float] [--sequence S] [--balance on|off] [--vdc V]',
  options: [
    { name: 'format', type: 'string', value: 'FMT', help: 'json (plan + table), csv (one row per polarity x triangle x vertex) or c (header)' },
    { name: 'out', type: 'string', value: 'FILE', help: 'output file; an existing file is replaced atomically' },
    ...LEG_OPTIONS,
    ...ANGLE_OPTIONS,
    { name: 'prefix', type: 'string', value: 'ID', help: 'C symbol prefix (default hs)' },
    { name: 'c-type', type: 'string', value: 'T', help: 'C: floating type of the tables, double (default) or float (half the size, dwell to about 1e-6)' },
    ...RUNTIME_OPTIONS,
    VDC_OPTION,
    HELP_OPTION,
  ],
  run: async (args, io) => {
    const format = args.values.get('format');
    if (!FORMATS.includes(format as (typeof FORMATS)[number])) throw usage('--format', `one of ${FORMATS.join(', ')}`, format);
    const out = args.values.get('out');
    if (typeof out !== 'string' || out === '') throw usage('--out', 'an output file path');
    const { topology, faults, rules } = legInputs(args);
    const angles = angleInputs(args);
    const runtime = runtimeInputs(args);
    const vdc = vdcInput(args);
    const atlas = diagramAtlas({ topology, faults, ...rules });
    const table = switchingTableFromAtlas(atlas);
    const plan = planFromAtlas(atlas, angles.loadAngleDeg, angles.polarityMarginDeg);
    let text: string;
    if (format === 'json') text = `${JSON.stringify(exportDocument(vdc === undefined ? plan : withVolts(plan, vdc), table))}\n`;
    else if (format === 'csv') text = exportCsv(table);
    else {
      const cType = (args.values.get('c-type') as string | undefined) ?? 'double';
      if (cType !== 'double' && cType !== 'float') throw usage('--c-type', 'double or float', cType);
      const derating = deratingSteps(atlas, { polarityMarginDeg: angles.polarityMarginDeg });
      text = exportC(table, {
        prefix: (args.values.get('prefix') as string | undefined) ?? 'hs',
        cType,
        fileName: out,
        limits: plan,
        runtime,
        derating,
        ...(vdc === undefined ? {} : { vdc }),
      });
    }
    await writeFileAtomic(out, text);
    await io.stdout(`wrote ${out} (${format}, ${Buffer.byteLength(text)} bytes)\n`);
    return 0;
  },
};
