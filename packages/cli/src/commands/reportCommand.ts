import { readFileSync } from 'node:fs';
import { diagramAtlas, planFromAtlas, switchingTableFromAtlas } from '@hexsalvage/core';
import { usage } from '../args.js';
import { ATLAS_OPTIONS, atlasFromArgs } from '../atlasInputs.js';
import { ANGLE_OPTIONS, HELP_OPTION, LEG_OPTIONS, type Command } from '../command.js';
import { angleInputs, legInputs } from '../legInputs.js';
import { writeFileAtomic } from '../output.js';
import { judgeClaims } from '../readClaims.js';
import { buildReport } from '../report/buildReport.js';

const VERSION = (JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8')) as { version: string }).version;

/** `hexsalvage report`: one self-contained HTML file for a design review. */
export const reportCommand: Command = {
  name: 'report',
  summary: 'write a self-contained HTML design-review report (limit, plots, table, flags, claims)',
  usage: 'report --topology T [--fault F]... [--load-angle DEG] [--polarity-margin DEG] [--claims FILE] [--atlas [atlas options]] --out FILE.html',
  options: [
    ...LEG_OPTIONS,
    ...ANGLE_OPTIONS,
    { name: 'claims', type: 'string', value: 'FILE', help: 'also show the verdicts of a claims file' },
    { name: 'atlas', type: 'flag', help: 'add an appendix with every fault of the leg (the fault atlas; shaped by the atlas options)' },
    ...ATLAS_OPTIONS,
    { name: 'out', type: 'string', value: 'FILE', help: 'output .html file (replaced atomically)' },
    HELP_OPTION,
  ],
  run: async (args, io) => {
    const out = args.values.get('out');
    if (typeof out !== 'string' || !out.endsWith('.html')) throw usage('--out', 'a file name ending in .html', out);
    const { topology, faults, topologyText, rules } = legInputs(args);
    const { loadAngleDeg, polarityMarginDeg } = angleInputs(args);
    const claimsFile = args.values.get('claims') as string | undefined;
    const verdicts = claimsFile ? judgeClaims(claimsFile, rules.ignoreRatings) : undefined;
    const atlas = diagramAtlas({ topology, faults, ...rules });
    const atlasFlags = ['modes', 'load-angle-range', 'step', 'jobs'].filter((k) => args.values.has(k)).concat(args.flags.has('pairs') ? ['pairs'] : []);
    if (!args.flags.has('atlas') && atlasFlags.length > 0) throw usage(`--${atlasFlags[0]}`, 'only together with --atlas');
    const faultAtlas = args.flags.has('atlas') ? await atlasFromArgs(args, io, false, true) : undefined;
    const html = buildReport({
      atlas,
      plan: planFromAtlas(atlas, loadAngleDeg, polarityMarginDeg),
      table: switchingTableFromAtlas(atlas),
      topologyText,
      ...(verdicts ? { verdicts } : {}),
      ...(faultAtlas ? { faultAtlas } : {}),
      generatedBy: `hexsalvage ${VERSION}`,
    });
    writeFileAtomic(out, html);
    await io.stdout(`wrote ${out} (review report, ${Buffer.byteLength(html)} bytes)\n`);
    return 0;
  },
};
