import { describeRules, type FaultAtlas } from '@hexsalvage/core';
import { csvCell, csvText } from '@hexsalvage/core/internal';
import { usage } from '../inputs/args.js';
import { ATLAS_OPTIONS, atlasFromArgs } from '../inputs/atlasInputs.js';
import { HELP_OPTION, JSON_OPTION, RULE_OPTIONS, type Command } from '../command.js';
import { cautionBlock, fmt, textTable } from '../format.js';
import { writeFileAtomic } from '../output/output.js';

/** `hexsalvage atlas`: every fault of a leg (or every pair) at once. */
export const atlasCommand: Command = {
  name: 'atlas',
  summary: 'every single fault (or pair of faults) of a leg at once: limit over a load-angle range, verdict, reason',
  usage:
    'atlas --topology T [--modes open,short] [--load-angle-range LO,HI] [--step DEG] [--polarity-margin DEG] [--pairs] [--jobs N] [--vdc V] [--json|--csv] [--out FILE]',
  options: [
    { name: 'topology', type: 'string', value: 'T', help: 'built-in leg (two-level, npc, anpc, anpc-hybrid, tnpc) or a netlist .json file' },
    ...RULE_OPTIONS,
    ...ATLAS_OPTIONS.slice(0, 3),
    { name: 'polarity-margin', type: 'number', min: 0, max: 60, value: 'DEG', help: 'polarity margin delta in degrees, 0 <= delta < 60 (default 0)' },
    ...ATLAS_OPTIONS.slice(3),
    { name: 'vdc', type: 'number', min: 0, openMin: true, value: 'V', help: 'total DC-link voltage in volts: adds phase peak and line RMS volts' },
    { name: 'csv', type: 'flag', help: 'print CSV, one row per fault set, with the mMax curve as columns' },
    JSON_OPTION,
    { name: 'out', type: 'string', value: 'FILE', help: 'also write the output to FILE (replaced atomically)' },
    HELP_OPTION,
  ],
  run: async (args, io) => {
    if (args.flags.has('csv') && args.flags.has('json')) throw usage('--csv', 'either --csv or --json, not both');
    const out = args.values.get('out') as string | undefined;
    if (out !== undefined && out === '') throw usage('--out', 'an output file path');
    const json = args.flags.has('json');
    const doc = await atlasFromArgs(args, io, json);
    const text = json ? `${JSON.stringify(doc)}\n` : args.flags.has('csv') ? atlasCsv(doc) : `${atlasText(doc)}\n`;
    if (out !== undefined) await writeFileAtomic(out, text);
    if (out === undefined || json) await io.stdout(text);
    else await io.stdout(`wrote ${out} (${doc.entries.length} fault sets, ${Buffer.byteLength(text)} bytes)\n`);
    return 0;
  },
};

const VERDICT_WORDS: Readonly<Record<FaultAtlas['entries'][number]['verdict'], string>> = {
  full: 'full voltage',
  derated: 'derated',
  'cannot-run': 'CANNOT RUN',
};

/**
 * The atlas as terminal text: worst first, with the verdict in words and the reason.
 *
 * @param a - the atlas document
 * @returns text
 * @example
 * ```ts
 * atlasText(faultAtlas({ topology: 'npc' }));
 * ```
 */
export function atlasText(a: FaultAtlas): string {
  const volts = a.volts !== undefined;
  const rows = a.entries.map((e) => [
    e.faults.join(' + '),
    VERDICT_WORDS[e.verdict],
    fmt(e.mMaxMin, 4),
    fmt(e.deratingRatio, 3),
    ...(volts ? [fmt(e.volts?.lineRmsMin ?? 0, 0)] : []),
    fmt(e.worstLoadAngleDeg, 1),
    fmt(e.mMaxHullMin, 4),
    e.bestRemedy ? `${e.bestRemedy.id} → ${fmt(e.bestRemedy.mMaxMin, 4)}` : '-',
    e.reason,
  ]);
  const count = (v: string) => a.entries.filter((e) => e.verdict === v).length;
  const [lo, hi] = a.loadAngleRangeDeg;
  return [
    `Fault atlas of ${a.topology}: ${a.pairs ? 'every pair of faults in any phases' : 'every single fault of phase a (b and c are the same by rotation)'}, modes ${a.modes.join(', ')}`,
    `Load angle ${fmt(lo, 1)}° to ${fmt(hi, 1)}°, polarity margin ${fmt(a.polarityMarginDeg, 1)}°. Rules: ${describeRules(a.rules)}.`,
    `Healthy leg over the range: mMax ${fmt(a.healthy.mMaxMin, 4)}${a.volts ? ` (${fmt(a.volts.lineRmsMaxHealthy, 0)} V line RMS at Vdc ${fmt(a.volts.vdc, 0)} V)` : ''}.`,
    '',
    textTable(['faults', 'verdict', 'mMax min', 'ratio', ...(volts ? ['line V rms'] : []), 'worst at deg', 'hull min', 'best remedy', 'why'], rows),
    '',
    `${a.entries.length} fault sets: ${count('full')} keep full voltage, ${count('derated')} need derating, ${count('cannot-run')} cannot run (the drive must stop). ${a.classesComputed} computed, the rest follow by phase rotation.`,
    "mMax min: the safe limit (ratings and commutation respected), its minimum over the whole load-angle range, exact; hull min: the first version's convex-hull bound, for comparison only.",
    'best remedy: what raises mMax min most (clear-shorts: each short cleared to an open by a fuse; bypass-<phase>: that phase tied to the DC midpoint, its gates off), with the mMax min it leaves; "-" where none does better (see plan for every remedy).',
    ...(a.unrated.length ? [`Unrated devices (voltage not checked): ${a.unrated.join(', ')}.`] : []),
    cautionBlock(a.cautions),
  ].join('\n');
}

/**
 * The atlas as CSV: one row per fault set, worst first, the curve as `m_max_at_<deg>` columns.
 *
 * @param a - the atlas document
 * @returns CSV text with a header row
 * @example
 * ```ts
 * atlasCsv(faultAtlas({ topology: 'npc' })).split('\n')[0];
 * ```
 */
export function atlasCsv(a: FaultAtlas): string {
  const grid = a.healthy.mMaxAt.map(([phi]) => phi);
  const volts = a.volts !== undefined;
  const head = [
    'faults',
    'verdict',
    'm_max_min',
    'derating_ratio',
    'worst_load_angle_deg',
    'm_max_hull_min',
    ...(volts ? ['phase_peak_min_v', 'line_rms_min_v'] : []),
    'best_remedy',
    'best_remedy_m_max_min',
    'reason',
    ...grid.map((g) => `m_max_at_${g}`),
  ];
  const rows = a.entries.map((e) =>
    [
      csvCell(csvText(e.faults.join(' + '))),
      e.verdict,
      e.mMaxMin.toFixed(9),
      e.deratingRatio.toFixed(9),
      String(e.worstLoadAngleDeg),
      e.mMaxHullMin.toFixed(9),
      ...(volts ? [(e.volts?.phasePeakMin ?? 0).toFixed(3), (e.volts?.lineRmsMin ?? 0).toFixed(3)] : []),
      e.bestRemedy?.id ?? '',
      e.bestRemedy ? e.bestRemedy.mMaxMin.toFixed(9) : '',
      csvCell(csvText(e.reason)),
      ...e.mMaxAt.map(([, m]) => m.toFixed(9)),
    ].join(','),
  );
  return `${head.join(',')}\n${rows.join('\n')}\n`;
}
