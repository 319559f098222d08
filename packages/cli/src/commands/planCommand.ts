import { planRemedial, type RemedialPlan } from '@hexsalvage/core';
import { ANGLE_OPTIONS, HELP_OPTION, JSON_OPTION, LEG_OPTIONS, type Command } from '../command.js';
import { cautionBlock, fmt, textTable } from '../format.js';
import { angleInputs, legInputs } from '../legInputs.js';

/** `hexsalvage plan`: exact limit, derating and the polarity sectors at one load angle. */
export const planCommand: Command = {
  name: 'plan',
  summary: 'exact maximum modulation index, derating, binding edge and polarity sectors at one load angle',
  usage: 'plan --topology T [--fault F]... [--load-angle DEG] [--polarity-margin DEG] [--json]',
  options: [...LEG_OPTIONS, ...ANGLE_OPTIONS, JSON_OPTION, HELP_OPTION],
  run: async (args, io) => {
    const { topology, faults } = legInputs(args);
    const plan = planRemedial({ topology, faults, ...angleInputs(args) });
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
  const edge = plan.bindingEdge
    ? `between ${plan.bindingEdge.map((v) => `${v.class} vector ${v.levels[0]?.join('/')} (${fmt(v.alpha, 3)}, ${fmt(v.beta, 3)})`).join(' and ')}`
    : 'none: the hull of the surviving vectors does not strictly contain the origin there';
  const lostFor = (pol: string) => plan.polarities[pol]?.lost.length ?? 0;
  const rows = plan.sectors.map((s) => [`${fmt(s.fromDeg, 2)}`, `${fmt(s.toDeg, 2)}`, s.polarity, String(s.vectors.length), String(lostFor(s.polarity)), String(s.triangles.length), fmt(s.minExtent, 4), fmt(s.minExtentAngleDeg, 2)]);
  return [
    `Leg: ${plan.topology}   faults: ${plan.faults.join(', ') || 'none'}`,
    `Load angle: ${fmt(plan.loadAngleDeg, 2)} deg   polarity margin: ${fmt(plan.polarityMarginDeg, 2)} deg`,
    '',
    `Maximum modulation index (faulted): ${fmt(plan.mMax, 6)}`,
    `Maximum modulation index (healthy): ${fmt(plan.mMaxHealthy, 6)}`,
    `Derating ratio:                     ${fmt(plan.deratingRatio, 6)}`,
    `Limit binds at theta = ${fmt(plan.limitingAngleDeg, 3)} deg with polarity ${plan.limitingPolarity}, on the hull edge ${edge}.`,
    '',
    'Polarity sectors of the fundamental cycle:',
    textTable(['from deg', 'to deg', 'polarity', 'vectors', 'lost', 'triangles', 'min r', 'at deg'], rows),
    '',
    'm is the peak fundamental phase voltage over Vdc/2; the healthy linear limit is 2/sqrt(3) = 1.1547.',
    cautionBlock(plan.cautions),
  ].join('\n');
}
