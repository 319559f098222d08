import { CAUTIONS, type ClaimVerdict } from '@hexsalvage/core';
import { usage } from '../inputs/args.js';
import { HELP_OPTION, JSON_OPTION, type Command } from '../command.js';
import { cautionBlock, claimRulesText, fmt, textTable, tripletText } from '../format.js';
import { judgeClaims } from '../inputs/readClaims.js';

/** `hexsalvage check`: verdicts on derating claims, exit 1 when any fails. */
export const checkCommand: Command = {
  name: 'check',
  summary: 'decide derating claims exactly over their load-angle ranges (exit 1 if any fails)',
  usage: 'check CLAIMS.json [--ignore-ratings] [--json]',
  positionals: 1,
  options: [
    { name: 'ignore-ratings', type: 'flag', help: 'judge every claim without the device voltage-rating check (unsafe; first version)' },
    JSON_OPTION,
    HELP_OPTION,
  ],
  run: async (args, io) => {
    const file = args.positionals[0];
    if (file === undefined || args.positionals.length > 1) throw usage('CLAIMS.json', 'one claims file');
    const verdicts = judgeClaims(file, args.flags.has('ignore-ratings'));
    if (args.flags.has('json')) await io.stdout(`${JSON.stringify({ claims: verdicts })}\n`);
    else await io.stdout(`${checkText(verdicts)}\n`);
    return verdicts.every((v) => v.holds) ? 0 : 1;
  },
};

/**
 * Readable verdicts.
 *
 * @param verdicts - from `evaluateClaim`
 * @returns terminal text
 * @example
 * ```ts
 * checkText([evaluateClaim(claim)]);
 * ```
 */
export function checkText(verdicts: readonly ClaimVerdict[]): string {
  const volts = verdicts.some((v) => v.volts);
  const vcol = (v: ClaimVerdict) =>
    volts ? [v.volts ? `${fmt(v.volts.lineRmsPromised, 1)} / ${fmt(v.volts.lineRmsAtWorst, 1)} V (Vdc ${fmt(v.volts.vdc, 0)} V)` : '-'] : [];
  const rows = verdicts.map((v) => [
    v.name,
    v.holds ? 'HOLDS' : 'FAILS',
    fmt(v.m, 4),
    fmt(v.mMaxAtWorst, 6),
    ...vcol(v),
    fmt(v.mMaxHullAtWorst, 6),
    `${fmt(v.loadAngleDeg[0], 1)}…${fmt(v.loadAngleDeg[1], 1)}`,
    fmt(v.worstLoadAngleDeg, 3),
    v.holds ? '-' : fmt(v.shortfall, 6),
    claimRulesText(v),
    edgeText(v),
  ]);
  const failing = verdicts.filter((v) => !v.holds).length;
  const unsafeRules = verdicts.filter((v) => !v.rules.ratings || v.rules.levelSteps === 'any');
  const unchecked = verdicts.filter((v) => v.rules.ratings && v.unrated.length > 0);
  return [
    textTable(
      [
        'claim',
        'verdict',
        'm promised',
        'worst mMax',
        ...(volts ? ['line RMS promised / at worst'] : []),
        'hull limit',
        'load deg range',
        'worst at deg',
        'short by',
        'rules',
        'binding edge there',
      ],
      rows,
    ),
    '',
    "worst mMax: the safe limit (ratings and commutation respected); hull limit: the first version's convex-hull bound, shown for comparison only.",
    ...(unsafeRules.length
      ? [`WARNING: ${unsafeRules.map((v) => v.name).join(', ')} judged with relaxed rules; such a verdict does not show the hardware survives.`]
      : []),
    ...(unchecked.length
      ? [
          `NOTE: ${unchecked.map((v) => v.name).join(', ')}: devices without a voltage rating were not checked (give each device a "rating" in the netlist); the verdict does not cover their voltage stress.`,
        ]
      : []),
    failing ? `${failing} of ${verdicts.length} claims FAIL.` : `All ${verdicts.length} claims hold over their whole load-angle ranges.`,
    cautionBlock(CAUTIONS),
  ].join('\n');
}

function edgeText(v: ClaimVerdict): string {
  if (!v.bindingEdge) return v.mMaxAtWorst === 0 ? 'none: cannot run in this state' : 'none';
  return `${v.bindingEdge.map((e) => `${e.class} ${tripletText(e.levels[0] ?? [], v.dcLevels)}`).join(' – ')} (θ ${fmt(v.limitingAngleDeg, 1)}°, ${v.limitingPolarity})`;
}
