import { describe, expect, it } from 'vitest';
import { analyseLeg, BUILTIN_TOPOLOGIES, builtinLeg, type BuiltinTopology } from '@hexsalvage/core';
import { expandElements } from '@hexsalvage/core/internal';

type Level = number | null;
type Row = Record<string, [Level, Level] | 'forbidden'>; // pattern → [level for i>0, level for i<0]

function rowOf(topology: BuiltinTopology, fault: string, ignoreRatings: boolean): Row {
  const t = analyseLeg({ topology, faults: [fault], ignoreRatings }).phases.a;
  return Object.fromEntries(t.patterns.map((p) => [p.name, p.status === 'allowed' ? [p.bySign['+'].level, p.bySign['-'].level] : 'forbidden']));
}

/*
 * Open faults with device ratings (contract, Version 2): what the static voltage check takes away
 * from the first version's tables (test/core/legTable.test.ts). Every built-in element rated 1
 * (half the link) in the clamped legs; two-level and the T-type outer devices rated 2. An entry
 * lists the patterns whose level becomes unusable for a sign, and the device blamed. Elements not
 * listed keep the first version's table exactly: no state of theirs stretches a device.
 */
const OPEN_UNSAFE: Record<BuiltinTopology, Record<string, Record<string, { '+'?: string; '-'?: string }>>> = {
  'two-level': {}, // every device blocks at most the link, its rating
  npc: {
    // P with innerUpper open, i>0: the current freewheels from N through the lower diodes (out = −1)
    // while outerUpper holds X at P: the failed switch's own diode would block X − out = 2.
    innerUpper: { P: { '+': 'innerUpper.diode blocks 2 > rating 1' } },
    innerLower: { N: { '-': 'innerLower.diode blocks 2 > rating 1' } }, // the mirror case
    // O with the upper clamp diode open, i>0: out = −1 through the lower diodes, innerUpper on puts
    // X at or below out, so outerUpper would block P − X ≥ 2.
    clampUpper: { O: { '+': 'outerUpper blocks 2 > rating 1' } },
    clampLower: { O: { '-': 'outerLower blocks 2 > rating 1' } }, // the mirror case
  },
  anpc: {
    // O-upper {clampUpper, innerUpper} with clampUpper's diode open, i>0: X is fed by nothing, the
    // current comes from N (out = −1), innerUpper on pulls X to −1: outerUpper blocks 2.
    'clampUpper.diode': { 'O-upper': { '+': 'outerUpper blocks 2 > rating 1' } },
    'clampLower.diode': { 'O-lower': { '-': 'outerLower blocks 2 > rating 1' } },
  },
  'anpc-hybrid': {
    // O-upper {outerLower, innerUpper, clampUpper} with clampUpper open, i<0: out drains through
    // innerUpper and outerUpper's diode to P (out = +1); outerLower holds Y at N: innerLower blocks 2.
    clampUpper: { 'O-upper': { '-': 'innerLower blocks 2 > rating 1' } },
    // O-upper with clampUpper's diode open, i>0: X unfed, out = −1 through outerLower/innerLower
    // diodes; the MOSFET innerUpper gated on joins X to out: outerUpper blocks P − X = 2.
    'clampUpper.diode': { 'O-upper': { '+': 'outerUpper blocks 2 > rating 1' } },
    // O-lower {outerUpper, innerLower, clampLower} with clampLower open, i>0: out = −1 through the
    // lower diodes while outerUpper holds X at P: innerUpper blocks 2.
    clampLower: { 'O-lower': { '+': 'innerUpper blocks 2 > rating 1' } },
    'clampLower.diode': { 'O-lower': { '-': 'outerLower blocks 2 > rating 1' } },
  },
  tnpc: {}, // outer devices rated for the whole link; the neutral branch never sees more than half
};

/*
 * Short faults (the element conducts both ways whatever its gate), ratings applied. A short of a
 * switch and of its own diode are the same circuit, so they share a row.
 */
const SHORT: Record<BuiltinTopology, Record<string, Row>> = {
  'two-level': {
    // upper shorted ties out to P: N (lower on) joins P to N.
    upper: { P: [1, 1], N: 'forbidden' },
    lower: { P: 'forbidden', N: [-1, -1] },
  },
  npc: {
    // X tied to P. O: innerUpper on gives P→X→out→Y→O (clampLower): shoot-through. N: out = −1,
    // innerUpper between X = +1 and out = −1 would block 2 (the first case): unsafe.
    outerUpper: { P: [1, 1], O: 'forbidden', N: [null, null] },
    // out tied to X: N puts out at −1, so the clamp diode O→X→out→…→N shoots through.
    innerUpper: { P: [1, 1], O: [0, 0], N: 'forbidden' },
    innerLower: { P: 'forbidden', O: [0, 0], N: [-1, -1] },
    outerLower: { P: [null, null], O: 'forbidden', N: [-1, -1] },
    // X tied to O: P (outerUpper on) shorts P to O.
    clampUpper: { P: 'forbidden', O: [0, 0], N: [-1, -1] },
    clampLower: { P: [1, 1], O: [0, 0], N: 'forbidden' },
  },
  anpc: {
    // X tied to P: every pattern gating clampUpper (X→O) shorts P to O. O-lower keeps X = P and
    // out = O, so innerUpper and clampUpper block 1 each: within ratings.
    outerUpper: { P: [1, 1], 'O-upper': 'forbidden', 'O-lower': [0, 0], 'O-both': 'forbidden', N: 'forbidden' },
    // out tied to X: N gates clampUpper (X→O) while out sits at N: O→X→out→…→N.
    innerUpper: { P: [1, 1], 'O-upper': [0, 0], 'O-lower': [0, 0], 'O-both': [0, 0], N: 'forbidden' },
    innerLower: { P: 'forbidden', 'O-upper': [0, 0], 'O-lower': [0, 0], 'O-both': [0, 0], N: [-1, -1] },
    outerLower: { P: 'forbidden', 'O-upper': [0, 0], 'O-lower': 'forbidden', 'O-both': 'forbidden', N: [-1, -1] },
    // X tied to O: P (outerUpper on) shorts P to O.
    clampUpper: { P: 'forbidden', 'O-upper': [0, 0], 'O-lower': [0, 0], 'O-both': [0, 0], N: [-1, -1] },
    clampLower: { P: [1, 1], 'O-upper': [0, 0], 'O-lower': [0, 0], 'O-both': [0, 0], N: 'forbidden' },
  },
  'anpc-hybrid': {
    // X tied to P: O-upper and N gate clampUpper (X→O): P to O.
    outerUpper: { P: [1, 1], 'O-lower': [0, 0], 'O-upper': 'forbidden', N: 'forbidden' },
    // out tied to X: O-lower has X = P (outerUpper on) and out on Y = O (clampLower): P to O.
    innerUpper: { P: [1, 1], 'O-lower': 'forbidden', 'O-upper': [0, 0], N: 'forbidden' },
    innerLower: { P: 'forbidden', 'O-lower': [0, 0], 'O-upper': 'forbidden', N: [-1, -1] },
    outerLower: { P: 'forbidden', 'O-lower': 'forbidden', 'O-upper': [0, 0], N: [-1, -1] },
    // X tied to O: P and O-lower gate outerUpper: P to O.
    clampUpper: { P: 'forbidden', 'O-lower': 'forbidden', 'O-upper': [0, 0], N: [-1, -1] },
    clampLower: { P: [1, 1], 'O-lower': [0, 0], 'O-upper': 'forbidden', N: 'forbidden' },
  },
  tnpc: {
    // out tied to P: O (outToNeutral on) and N short P to O and to N.
    upper: { P: [1, 1], O: 'forbidden', N: 'forbidden' },
    lower: { P: 'forbidden', O: 'forbidden', N: [-1, -1] },
    // M tied to O: N gates outToNeutral (out→M): O→M→out→N through the shorted branch.
    neutralToOut: { P: [1, 1], O: [0, 0], N: 'forbidden' },
    outToNeutral: { P: 'forbidden', O: [0, 0], N: [-1, -1] },
  },
};

function firstVersion(topology: BuiltinTopology, element: string): Row {
  return rowOf(topology, `a.${element}`, true);
}

describe('leg tables with device ratings (hand-worked, contract Version 2)', () => {
  const elements = BUILTIN_TOPOLOGIES.flatMap((t) => expandElements(builtinLeg(t)).map((e) => [t, e.id] as const));

  it.each(elements)('%s with %s open: the first version minus the unsafe states', (topology, element) => {
    const expected = firstVersion(topology, element);
    for (const [pattern, signs] of Object.entries(OPEN_UNSAFE[topology][element] ?? {})) {
      const row = expected[pattern] as [Level, Level];
      if (signs['+']) row[0] = null;
      if (signs['-']) row[1] = null;
    }
    expect(rowOf(topology, `a.${element}`, false)).toEqual(expected);
    const t = analyseLeg({ topology, faults: [`a.${element}`] }).phases.a;
    const reasons = Object.fromEntries(t.patterns.flatMap((p) => (p.status === 'allowed' && Object.keys(p.unsafe).length > 0 ? [[p.name, p.unsafe]] : [])));
    expect(reasons).toEqual(OPEN_UNSAFE[topology][element] ?? {});
  });

  it.each(elements)('%s with %s shorted', (topology, element) => {
    const row = SHORT[topology][element.replace(/\.diode$/, '')];
    expect(row).toBeDefined();
    expect(rowOf(topology, `a.${element}:short`, false)).toEqual(row);
  });

  it('names the overstressed device of a shorted NPC outer switch (common practice: with X tied to P, state N puts the whole link across innerUpper)', () => {
    const t = analyseLeg({ topology: 'npc', faults: ['a.outerUpper:short'] }).phases.a;
    const n = t.patterns.find((p) => p.name === 'N');
    expect(n).toMatchObject({ status: 'allowed', unsafe: { '+': 'innerUpper blocks 2 > rating 1', '-': 'innerUpper blocks 2 > rating 1' } });
    expect(t.levels).toEqual({ '+': [1], '-': [1], '?': [1] });
  });

  it('lists unrated devices of a netlist without ratings and checks nothing there', () => {
    const leg = { ...builtinLeg('npc'), devices: builtinLeg('npc').devices.map(({ rating: _r, ...d }) => d) };
    const a = analyseLeg({ topology: leg, faults: ['a.innerUpper'] });
    expect(a.unrated).toEqual(['outerUpper', 'innerUpper', 'innerLower', 'outerLower', 'clampUpper', 'clampLower']);
    expect(a.phases.a.levels['+']).toEqual([-1]); // the first version's levels: nothing is checked
    expect(analyseLeg({ topology: 'npc' }).unrated).toEqual([]);
  });
});
