import { CAUTIONS, describeRules, levelNotation, parsePolarity, polarityDocument, type PlanVector } from '@hexsalvage/core';
import { faultTexts, diagramAtlas } from '@hexsalvage/core/internal';
import { usage } from '../inputs/args.js';
import { HELP_OPTION, JSON_OPTION, LEG_OPTIONS, type Command } from '../command.js';
import { cautionBlock, fmt, levelText, textTable, tripletText } from '../format.js';
import { legInputs } from '../inputs/legInputs.js';

/** `hexsalvage vectors`: surviving vectors, hull and triangles for one polarity string. */
export const vectorsCommand: Command = {
  name: 'vectors',
  summary: 'surviving space vectors, hull, triangles and radius for one current-polarity pattern',
  usage: 'vectors --topology T [--fault F]... --polarity XYZ [--json]',
  options: [
    ...LEG_OPTIONS,
    { name: 'polarity', type: 'string', value: 'XYZ', help: 'current polarity of phases a, b, c: each +, - or ?, e.g. +-?' },
    JSON_OPTION,
    HELP_OPTION,
  ],
  run: async (args, io) => {
    const { topology, faults, rules } = legInputs(args);
    const pol = args.values.get('polarity');
    if (pol === undefined) throw usage('--polarity', 'a polarity string such as +-? (phases a, b, c)');
    parsePolarity(pol, '--polarity');
    const atlas = diagramAtlas({ topology, faults, ...rules });
    const d = atlas.faulted.get(pol as string);
    if (!d) throw usage('--polarity', 'a polarity string such as +-?', pol);
    const doc = polarityDocument(d);
    if (args.flags.has('json')) {
      await io.stdout(`${JSON.stringify({ polarity: pol, ...doc })}\n`);
      return 0;
    }
    const dc = Object.values(atlas.analysis.leg.dcNodes);
    const vec = (v: PlanVector) => [fmt(v.alpha), fmt(v.beta), fmt(Math.hypot(v.alpha, v.beta)), v.class, v.levels.map((t) => tripletText(t, dc)).join(' ')];
    const lines = [
      `Leg: ${atlas.analysis.topology}   faults: ${faultTexts(atlas.analysis).join(', ') || 'none'}   polarity: ${pol}`,
      `Rules: ${describeRules(atlas.analysis.rules)}`,
      `Phase levels used: ${(['a', 'b', 'c'] as const).map((ph, k) => `${ph} ${(d.phaseLevels[k] as readonly number[]).map((l) => levelText(l, dc)).join(', ') || '(none)'}`).join(' | ')}`,
      '',
      `Surviving vectors (${doc.vectors.length}):`,
      textTable(
        ['#', 'alpha', 'beta', '|v|', 'class', 'levels a, b, c'],
        doc.vectors.map((v, i) => [String(i), ...vec(v)]),
      ),
      '',
      `Lost vectors (${doc.lost.length}, ${doc.lostTriplets} healthy triplets lost in all):`,
      doc.lost.length ? textTable(['alpha', 'beta', '|v|', 'class', 'triplets'], doc.lost.map(vec)) : '  none',
      '',
      `Hull (${doc.hull.length} corners, counter-clockwise): ${doc.hull.map(([a, b]) => `(${fmt(a, 3)}, ${fmt(b, 3)})`).join(' ')}`,
      `Triangles (admissible, non-overlapping): ${doc.triangles.length}${doc.outline ? '  (they do not fill the hull)' : ''}`,
      `Reach (largest origin-centred circle inside the admissible triangles): ${fmt(doc.reach, 6)} x Vdc/2${doc.reach === 0 ? '  (cannot run with this pattern alone: the admissible triangles do not surround the origin)' : ''}`,
      `Radius of the hull (first version, not safe by itself): ${fmt(doc.radius, 6)} x Vdc/2`,
      `Vectors: ${levelNotation(dc).legend}.`,
      cautionBlock(CAUTIONS),
    ];
    await io.stdout(`${lines.join('\n')}\n`);
    return 0;
  },
};
