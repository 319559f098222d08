import { describeRules, levelNotation, planRemedial, unsafeRules, type RemedialPlan } from '@hexsalvage/core';
import { ANGLE_OPTIONS, HELP_OPTION, JSON_OPTION, LEG_OPTIONS, VDC_OPTION, type Command } from '../command.js';
import { cautionBlock, fmt, textTable, tripletText, voltsText } from '../format.js';
import { angleInputs, legInputs, vdcInput } from '../inputs/legInputs.js';

/** `hexsalvage plan`: exact limit, derating and the polarity sectors at one load angle. */
export const planCommand: Command = {
  name: 'plan',
  summary: 'exact maximum modulation index, derating, binding edge and polarity sectors at one load angle',
  usage: 'plan --topology T [--fault F]... [--load-angle DEG] [--polarity-margin DEG] [--vdc V] [--json]',
  options: [...LEG_OPTIONS, ...ANGLE_OPTIONS, VDC_OPTION, JSON_OPTION, HELP_OPTION],
  run: async (args, io) => {
    const { topology, faults, rules } = legInputs(args);
    const vdc = vdcInput(args);
    const plan = planRemedial({ topology, faults, ...rules, ...angleInputs(args), ...(vdc === undefined ? {} : { vdc }) });
    await io.stdout(args.flags.has('json') ? `${JSON.stringify(plan)}\n` : `${planText(plan)}\n`);
    return 0;
  },
};

/**
 * Readable plan summary.
 *
 * @param plan - a remedial plan
 * @returns terminal text
 * @example
 * ```ts
 * planText(planRemedial({ topology: 'npc', faults: ['a.outerUpper'] }));
 * ```
 */
export function planText(plan: RemedialPlan): string {
  const unsafe = unsafeRules(plan.rules);
  const edge = plan.bindingEdge
    ? `between ${plan.bindingEdge.map((v) => `${v.class} vector ${tripletText(v.levels[0] ?? [], plan.dcLevels)} (${fmt(v.alpha, 3)}, ${fmt(v.beta, 3)})`).join(' and ')}`
    : '';
  const verdict = plan.stop
    ? [
        `CANNOT RUN in this state${plan.stop.everyLoadAngle ? ' at any load angle' : ' at this load angle'}: the drive must stop; no output voltage above 0 can be produced${unsafe ? '' : ' safely'}.`,
        `Why: ${plan.stop.reason}`,
      ]
    : [`Limit binds at theta = ${fmt(plan.limitingAngleDeg, 3)} deg with polarity ${plan.limitingPolarity}, on the outline edge ${edge}.`];
  const hullNote =
    Math.abs(plan.mMaxHull - plan.mMax) > 1e-9
      ? [
          `The convex hull of the surviving vectors would promise ${fmt(plan.mMaxHull, 6)}; that is NOT safe: the rules above leave only the admissible triangles.`,
        ]
      : [];
  const lostFor = (pol: string) => plan.polarities[pol]?.lost.length ?? 0;
  const rows = plan.sectors.map((s) => [
    `${fmt(s.fromDeg, 2)}`,
    `${fmt(s.toDeg, 2)}`,
    s.polarity,
    String(s.vectors.length),
    String(lostFor(s.polarity)),
    String(s.triangles.length),
    fmt(s.minExtent, 4),
    fmt(s.minExtentAngleDeg, 2),
  ]);
  return [
    `Leg: ${plan.topology}   faults: ${plan.faults.join(', ') || 'none'}`,
    `Load angle: ${fmt(plan.loadAngleDeg, 2)} deg   polarity margin: ${fmt(plan.polarityMarginDeg, 2)} deg`,
    '',
    `Rules: ${describeRules(plan.rules)}${plan.unrated.length ? `; unrated (not checked): ${plan.unrated.join(', ')}` : ''}`,
    '',
    ...(plan.volts ? [`DC link: ${fmt(plan.volts.vdc, 1)} V (1 unit of Vdc/2 = ${fmt(plan.volts.vdc / 2, 1)} V)`] : []),
    `${`Maximum modulation index (faulted, ${unsafe ? 'NOT safe' : 'safe'}):`.padEnd(47)}${fmt(plan.mMax, 6)}${voltsText(plan.mMax, plan.volts?.vdc)}`,
    ...(unsafe ? [`  NOT a safe operating limit: ${unsafe}. For review only; never run a converter at it.`] : []),
    `Maximum modulation index (healthy):            ${fmt(plan.mMaxHealthy, 6)}${voltsText(plan.mMaxHealthy, plan.volts?.vdc)}`,
    `Derating ratio:                                ${fmt(plan.deratingRatio, 6)}`,
    `Convex-hull bound (first version, for review): ${fmt(plan.mMaxHull, 6)}`,
    `Midpoint held at zero average up to m =        ${fmt(plan.mMaxBalanced, 6)}${voltsText(plan.mMaxBalanced, plan.volts?.vdc)}`,
    ...verdict,
    ...hullNote,
    ...(plan.restrictions.length ? ['', 'What the rules take away:', ...plan.restrictions.map((r) => `  - ${r}`)] : []),
    ...(plan.notes.length ? ['', 'Notes:', ...plan.notes.map((n) => `  - ${n}`)] : []),
    ...alternativesText(plan),
    ...remediesText(plan),
    '',
    'Polarity sectors of the fundamental cycle:',
    textTable(['from deg', 'to deg', 'polarity', 'vectors', 'lost', 'triangles', 'min extent', 'at deg'], rows),
    '',
    'm is the peak fundamental phase voltage over Vdc/2; the healthy linear limit is 2/sqrt(3) = 1.1547.',
    `Vectors: ${levelNotation(plan.dcLevels).legend}.`,
    cautionBlock(plan.cautions),
  ].join('\n');
}

// An ambiguous diagnosis: the limit of each configuration alone beside the joint one.
function alternativesText(plan: RemedialPlan): string[] {
  const alts = plan.alternatives ?? [];
  if (alts.length < 2) return [];
  const rows = alts.map((a, i) => [a.join(', '), fmt(plan.mMaxByAlternative?.[i] ?? 0, 6)]);
  return [
    '',
    `Ambiguous diagnosis: the plan holds whichever of ${alts.length} configurations is true (its mMax ${fmt(plan.mMax, 6)} is at most each one's):`,
    textTable(['configuration', 'mMax alone'], rows),
  ];
}

// What could be done about the fault, best first; a plan that cannot run says which remedy would.
function remediesText(plan: RemedialPlan): string[] {
  const list = plan.remedies ?? [];
  if (list.length === 0) return [];
  const rows = list.map((r) => [r.id, fmt(r.mMax, 6), fmt(r.mMaxBalanced, 6), r.requires]);
  const runs = list.filter((r) => r.id !== 'as-is' && r.mMax > 0);
  const verdict =
    plan.mMax > 0
      ? []
      : [
          runs.length
            ? `A remedy that would run: ${runs[0]?.id} (mMax ${fmt(runs[0]?.mMax ?? 0, 6)}): ${runs[0]?.requires}.`
            : `No remedy considered here lets the drive run: it must stop until repaired.${plan.dcLevels.includes(0) ? '' : ' (A bypass to the DC midpoint needs a split DC link with a node at potential 0; this leg has none.)'}`,
        ];
  return ['', 'Remedies (best first):', textTable(['remedy', 'mMax', 'mMax balanced', 'requires'], rows), ...verdict];
}
