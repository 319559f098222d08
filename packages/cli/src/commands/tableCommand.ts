import { lineRmsVolts, parsePolarity, switchingTable, type SwitchingTable } from '@hexsalvage/core';
import { HELP_OPTION, JSON_OPTION, LEG_OPTIONS, RUNTIME_OPTIONS, VDC_OPTION, type Command } from '../command.js';
import { cautionBlock, fmt, levelText, textTable, tripletText } from '../format.js';
import { legInputs, runtimeInputs, vdcInput } from '../inputs/legInputs.js';

/** `hexsalvage table`: the degraded switching-state table, readable. */
export const tableCommand: Command = {
  name: 'table',
  summary: 'degraded switching-state table: per polarity and triangle, states, sequence and flags',
  usage: 'table --topology T [--fault F]... [--polarity XYZ] [--sequence S] [--balance on|off] [--vdc V] [--json]',
  options: [
    ...LEG_OPTIONS,
    { name: 'polarity', type: 'string', value: 'XYZ', help: 'show one polarity string only (default: all 25)' },
    ...RUNTIME_OPTIONS,
    VDC_OPTION,
    JSON_OPTION,
    HELP_OPTION,
  ],
  run: async (args, io) => {
    const { topology, faults, rules } = legInputs(args);
    const vdc = vdcInput(args);
    const runtime = runtimeInputs(args);
    const table = switchingTable({ topology, faults, ...rules });
    const only = args.values.get('polarity') as string | undefined;
    if (only !== undefined) parsePolarity(only, '--polarity');
    if (args.flags.has('json')) {
      const doc = { ...(only === undefined ? table : onlyPolarity(table, only)), runtime };
      await io.stdout(`${JSON.stringify(vdc === undefined ? doc : { ...doc, volts: { vdc, unitVolts: vdc / 2 } })}\n`);
      return 0;
    }
    await io.stdout(
      `${tableText(table, only, vdc)}\nRuntime (what firmware runs, see docs/table.md): ${runtime.sequence} sequence, midpoint balance ${runtime.balance}; each period picks one of a triangle's candidate sequences, chained to the period before.\n`,
    );
    return 0;
  },
};

/**
 * Readable rendering of a switching table.
 *
 * @param table - the table
 * @param only - restrict to one polarity string
 * @param vdc - total DC-link voltage in volts: levels and reaches in volts too
 * @returns terminal text
 * @example
 * ```ts
 * tableText(switchingTable({ topology: 'npc' }), '+--');
 * ```
 */
export function tableText(table: SwitchingTable, only?: string, vdc?: number): string {
  const lines = [
    `Leg: ${table.topology}   faults: ${table.faults.join(', ') || 'none'}`,
    ...(vdc === undefined
      ? []
      : [
          `DC link ${fmt(vdc, 1)} V: levels ${table.levels.map((l) => `${levelText(l, table.levels)} = ${fmt((l * vdc) / 2, 1)} V`).join(', ')} (from the midpoint)`,
        ]),
    '',
  ];
  for (const pol of table.polarityOrder) {
    if (only !== undefined && pol !== only) continue;
    const p = table.polarities[pol];
    if (!p) continue;
    lines.push(
      `Polarity ${pol} (index ${p.index}): ${p.vectors.length} vectors, ${p.lost.length} lost${p.lost.length ? ` (${p.lost.map((v) => `${v.class} ${tripletText(v.levels[0] ?? [], table.levels)}`).join(', ')})` : ''}, ${p.tableTriangles.length} admissible triangles, reach ${fmt(p.reach, 4)}${vdc === undefined ? '' : ` (${fmt(lineRmsVolts(p.reach, vdc), 1)} V line RMS)`}`,
    );
    const rows = p.tableTriangles.map((tri, t) => {
      const seq = tri.sequence;
      const states = seq
        ? seq.states
            .map((s) =>
              tripletText(
                s.map((x) => x.level),
                table.levels,
              ),
            )
            .join(' > ')
        : '(none)';
      const pats = seq ? seq.states.map((s) => s.map((x) => x.pattern).join('/')).join(' > ') : '';
      const flags = [
        ...(seq?.lineDevicesSwitching.length ? [`LINE-RATE DEVICES AT PWM: ${seq.lineDevicesSwitching.join(' ')}`] : []),
        ...(seq?.levelJumps.length
          ? [`LEVEL JUMP ${seq.levelJumps.map((j) => `${j.phase} ${levelText(j.from, table.levels)}>${levelText(j.to, table.levels)}`).join(' ')}`]
          : []),
        ...(tri.authorityLost ? [`MIDPOINT CONTROL LOST (${tri.healthyMidpointAuthority}>${tri.midpointAuthority})`] : []),
      ];
      return [
        String(t),
        tri.vertices.map((v) => v.class).join('/'),
        states,
        pats,
        String(seq?.totalGateChanges ?? ''),
        tri.midpointAuthority,
        flags.join('; '),
      ];
    });
    if (rows.length) lines.push(textTable(['#', 'vertices', 'sequence (half period)', 'patterns a/b/c', 'changes', 'midpoint', 'flags'], rows));
    else lines.push('  no triangles: this polarity cannot be modulated (no admissible triangle)');
    lines.push('');
  }
  const f = (only === undefined ? table : onlyPolarity(table, only)).flags;
  lines.push(
    `Flags${only === undefined ? '' : ` (polarity ${only})`}: ${f.lineDevicesAtPwm.length} triangles drive line-frequency devices at PWM rate, ${f.levelJumps.length} have level jumps, ${f.midpointAuthorityLost.length} lost midpoint control.`,
  );
  lines.push(
    'Sequence: the reference order (fewest switchings) from the start to the centre of a centre-aligned period, mirrored after; changes = gate changes per period.',
  );
  lines.push(cautionBlock(table.cautions));
  return lines.join('\n');
}

/**
 * The table restricted to one polarity string: that polarity only, and only its flags.
 *
 * @param table - the full table
 * @param polarity - a valid polarity string
 * @returns a table document with one polarity
 * @example
 * ```ts
 * onlyPolarity(switchingTable({ topology: 'npc' }), '+--').polarityOrder; // ['+--']
 * ```
 */
export function onlyPolarity(table: SwitchingTable, polarity: string): SwitchingTable {
  const keep = <T extends { readonly polarity: string }>(list: readonly T[]) => list.filter((x) => x.polarity === polarity);
  const f = table.flags;
  return {
    ...table,
    polarityOrder: [polarity],
    polarities: { [polarity]: table.polarities[polarity]! },
    flags: {
      lineDevicesAtPwm: keep(f.lineDevicesAtPwm),
      levelJumps: keep(f.levelJumps),
      midpointAuthorityLost: keep(f.midpointAuthorityLost),
      noSequence: keep(f.noSequence),
    },
  };
}
