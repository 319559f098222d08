import { switchover, type Switchover } from '@hexsalvage/core';
import { HELP_OPTION, JSON_OPTION, LEG_OPTIONS, type Command } from '../command.js';
import { cautionBlock, fmt, textTable } from '../format.js';
import { legInputs } from '../inputs/legInputs.js';

/** `hexsalvage switchover`: from the fault to the degraded table, and what happens in between. */
export const switchoverCommand: Command = {
  name: 'switchover',
  summary: 'what the healthy table does once a device has failed, and the safe way into the degraded table',
  usage: 'switchover --topology T --fault F... [--m M --f1 HZ --fsw HZ [--load-angle DEG] [--polarity-margin DEG]] [--json]',
  options: [
    ...LEG_OPTIONS.filter((o) => o.name !== 'bypass'),
    { name: 'm', type: 'number', min: 0, max: 10, value: 'M', help: 'operating point: modulation index of the healthy runtime (units of Vdc/2)' },
    { name: 'load-angle', type: 'number', min: -180, max: 180, value: 'DEG', help: 'operating point: load angle, degrees (default 0)' },
    { name: 'polarity-margin', type: 'number', min: 0, max: 60, value: 'DEG', help: 'polarity margin delta in degrees, 0 <= delta < 60 (default 0)' },
    { name: 'f1', type: 'number', min: 0, openMin: true, max: 1e5, value: 'HZ', help: 'operating point: fundamental frequency, Hz' },
    { name: 'fsw', type: 'number', min: 0, openMin: true, max: 1e8, value: 'HZ', help: 'operating point: switching frequency, Hz' },
    JSON_OPTION,
    HELP_OPTION,
  ],
  run: async (args, io) => {
    const { topology, faults, rules } = legInputs(args);
    const num = (k: string) => args.values.get(k) as number | undefined;
    const point = Object.fromEntries(
      (
        [
          ['m', 'm'],
          ['loadAngleDeg', 'load-angle'],
          ['polarityMarginDeg', 'polarity-margin'],
          ['f1', 'f1'],
          ['fsw', 'fsw'],
        ] as const
      ).flatMap(([key, opt]) => (num(opt) === undefined ? [] : [[key, num(opt)]])),
    );
    const doc = switchover({ topology, faults, ...rules, ...point });
    await io.stdout(args.flags.has('json') ? `${JSON.stringify(doc)}\n` : `${switchoverText(doc)}\n`);
    return 0;
  },
};

const WORDS = { same: 'same', deviates: 'DEVIATES', unsafe: 'UNSAFE' } as const;

/**
 * The switch-over as terminal text.
 *
 * @param s - from `switchover`
 * @returns text
 * @example
 * ```ts
 * switchoverText(switchover({ topology: 'npc', faults: ['a.clampUpper'] }));
 * ```
 */
export function switchoverText(s: Switchover): string {
  const rows: string[][] = [];
  for (const [ph, pats] of Object.entries(s.details)) {
    for (const [name, cells] of Object.entries(pats)) {
      if (cells['+'].class === 'same' && cells['-'].class === 'same') continue;
      const cell = (c: (typeof cells)['+']) =>
        `${WORDS[c.class]}${c.class === 'deviates' ? ` (${fmt(c.healthyLevel ?? 0, 2)} → ${fmt(c.level ?? 0, 2)})` : ''}`;
      rows.push([ph, name, cell(cells['+']), cell(cells['-']), [cells['+'].reason, cells['-'].reason].filter(Boolean).join('; ')]);
    }
  }
  const exits = s.exits
    .filter((e) => e.steps === null || e.steps.length > 0)
    .map((e) => [e.phase, e.pattern, e.sign === '+' ? 'i > 0' : 'i < 0', e.steps === null ? 'none' : `${e.steps.join(', ')} → ${e.to}`, e.blockAll ?? '']);
  const run = s.run;
  return [
    `Switch-over of ${s.topology} with ${s.faults.join(', ') || 'no fault'}: what each healthy pattern does once the fault is present.`,
    '',
    rows.length
      ? textTable(['phase', 'pattern', 'i > 0', 'i < 0', 'why'], rows)
      : 'Every healthy pattern gives its level for both current signs: the fault changes nothing the healthy table commands.',
    ...(rows.length ? ['(patterns not listed: the same for both signs; levels in units of Vdc/2)'] : []),
    '',
    ...(run
      ? [
          `Healthy runtime at m ${fmt(run.m, 4)}, load angle ${fmt(run.loadAngleDeg, 1)}°, f1 ${fmt(run.f1, 1)} Hz, fsw ${fmt(run.fsw, 0)} Hz, with the fault present:`,
          `  ${run.states} states per fundamental period: ${run.unsafeStates} unsafe (${fmt(100 * run.unsafeShare, 1)} % of the time), ${run.deviatingStates} deviating; longest stretch without an unsafe state ${fmt(run.longestSafeS * 1000, 2)} ms.`,
          ...(run.firstUnsafe
            ? [
                `  First unsafe state: phase ${run.firstUnsafe.phase}, pattern ${run.firstUnsafe.pattern}, i ${run.firstUnsafe.sign === '+' ? '> 0' : '< 0'}, at ${fmt(run.firstUnsafe.tS * 1000, 3)} ms: ${run.firstUnsafe.reason}.`,
              ]
            : []),
          `  Verdict: ${run.verdict}.`,
          '',
        ]
      : ['Give --m, --f1 and --fsw (and --load-angle) to run the healthy table with the fault present.', '']),
    'After detection, from each healthy state of a faulted phase into the degraded table (single gate actions, every state on the way usable):',
    exits.length
      ? textTable(['phase', 'from', 'sign', 'gate actions → pattern', 'if none'], exits)
      : '  every healthy state the runtime uses is already a state of the degraded table: switch tables at the next period.',
    cautionBlock(s.cautions),
  ].join('\n');
}
