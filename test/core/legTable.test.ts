import { describe, expect, it } from 'vitest';
import { analyseLeg, BUILTIN_TOPOLOGIES, builtinLeg, type BuiltinTopology } from '@hexsalvage/core';
import { expandElements, legTable } from '@hexsalvage/core/internal';

type Row = Record<string, [number | null, number | null]>; // pattern → [level for i>0, level for i<0]

// Healthy tables: every default pattern gives its own level for both current signs.
const HEALTHY: Record<BuiltinTopology, Row> = {
  'two-level': { P: [1, 1], N: [-1, -1] },
  npc: { P: [1, 1], O: [0, 0], N: [-1, -1] },
  anpc: { P: [1, 1], 'O-upper': [0, 0], 'O-lower': [0, 0], 'O-both': [0, 0], N: [-1, -1] },
  'anpc-hybrid': { P: [1, 1], 'O-lower': [0, 0], 'O-upper': [0, 0], N: [-1, -1] },
  tnpc: { P: [1, 1], O: [0, 0], N: [-1, -1] },
};

/*
 * Single open faults, worked out by hand from the circuits of the interface contract.
 * Notation: "fed by" = DC nodes with a forward path into a node, "drains to" = DC nodes it has a
 * forward path to. For i>0 the output takes the highest DC node feeding it, for i<0 the lowest it
 * drains to; `null` = no path (current interrupted).
 */
const FAULTED: Record<BuiltinTopology, Record<string, Row>> = {
  // upper P→out (diode out→P), lower out→N (diode N→out).
  'two-level': {
    upper: { P: [-1, 1], N: [-1, -1] }, // P, i>0: only N→out through lower.diode remains
    'upper.diode': { P: [1, null], N: [-1, -1] }, // P, i<0: out→P diode gone and lower is off
    lower: { P: [1, 1], N: [-1, 1] }, // N, i<0: out drains only through upper.diode to P
    'lower.diode': { P: [1, 1], N: [null, -1] }, // N, i>0: nothing feeds out
  },
  // X fed by P (outerUpper on) and O (clampUpper diode); X drains to P (outerUpper.diode).
  // Y fed by N (outerLower.diode); Y drains to O (clampLower diode) and N (outerLower on).
  // out fed by X (innerUpper on) and Y (innerLower.diode); drains to X (innerUpper.diode) and Y (innerLower on).
  npc: {
    outerUpper: { P: [0, 1], O: [0, 0], N: [-1, -1] }, // P, i>0: X is fed by O only
    'outerUpper.diode': { P: [1, null], O: [0, 0], N: [-1, -1] }, // P, i<0: X drains nowhere, Y path off
    innerUpper: { P: [-1, 1], O: [-1, 0], N: [-1, -1] }, // i>0 can only come from N via innerLower.diode
    'innerUpper.diode': { P: [1, null], O: [0, 0], N: [-1, -1] }, // P, i<0: out→X gone, innerLower off
    innerLower: { P: [1, 1], O: [0, 1], N: [-1, 1] }, // i<0 can only drain through innerUpper.diode to P
    'innerLower.diode': { P: [1, 1], O: [0, 0], N: [null, -1] }, // N, i>0: nothing feeds out
    outerLower: { P: [1, 1], O: [0, 0], N: [-1, 0] }, // N, i<0: Y drains to O through clampLower
    'outerLower.diode': { P: [1, 1], O: [0, 0], N: [null, -1] }, // N, i>0: Y is fed by nothing
    clampUpper: { P: [1, 1], O: [-1, 0], N: [-1, -1] }, // O, i>0: X unfed, N feeds Y→out
    clampLower: { P: [1, 1], O: [0, 1], N: [-1, -1] }, // O, i<0: Y drains nowhere, out→X→P
  },
  // As npc, plus clampUpper X→O (on: X drains to O) and clampLower O→Y (on: Y fed by O); their
  // diodes O→X and Y→O conduct always.
  anpc: {
    outerUpper: { P: [0, 1], 'O-upper': [0, 0], 'O-lower': [0, 0], 'O-both': [0, 0], N: [-1, -1] }, // P, i>0: X fed by O, Y by O and N
    'outerUpper.diode': { P: [1, null], 'O-upper': [0, 0], 'O-lower': [0, 0], 'O-both': [0, 0], N: [-1, -1] }, // P, i<0: clampUpper off, X drains nowhere
    innerUpper: { P: [0, 1], 'O-upper': [-1, 0], 'O-lower': [0, 0], 'O-both': [0, 0], N: [-1, -1] }, // i>0 only via Y: O-upper has clampLower off, so N
    'innerUpper.diode': { P: [1, null], 'O-upper': [0, null], 'O-lower': [0, 0], 'O-both': [0, 0], N: [-1, -1] }, // i<0 only via innerLower
    innerLower: { P: [1, 1], 'O-upper': [0, 0], 'O-lower': [0, 1], 'O-both': [0, 0], N: [-1, 0] }, // i<0 only via X: P, or O where clampUpper is on
    'innerLower.diode': { P: [1, 1], 'O-upper': [0, 0], 'O-lower': [null, 0], 'O-both': [0, 0], N: [null, -1] }, // i>0 only via innerUpper
    outerLower: { P: [1, 1], 'O-upper': [0, 0], 'O-lower': [0, 0], 'O-both': [0, 0], N: [-1, 0] }, // N, i<0: Y drains to O by clampLower.diode
    'outerLower.diode': { P: [1, 1], 'O-upper': [0, 0], 'O-lower': [0, 0], 'O-both': [0, 0], N: [null, -1] }, // N, i>0: clampLower off, Y unfed
    clampUpper: { P: [1, 1], 'O-upper': [0, 1], 'O-lower': [0, 0], 'O-both': [0, 0], N: [-1, -1] }, // O-upper, i<0: X drains to P only; the other clamp path keeps O
    'clampUpper.diode': { P: [1, 1], 'O-upper': [-1, 0], 'O-lower': [0, 0], 'O-both': [0, 0], N: [-1, -1] }, // O-upper, i>0: X unfed, N via Y
    clampLower: { P: [1, 1], 'O-upper': [0, 0], 'O-lower': [-1, 0], 'O-both': [0, 0], N: [-1, -1] }, // O-lower, i>0: Y fed by N only
    'clampLower.diode': { P: [1, 1], 'O-upper': [0, 0], 'O-lower': [0, 1], 'O-both': [0, 0], N: [-1, -1] }, // O-lower, i<0: Y drains nowhere, out→X→P
  },
  // As anpc, but innerUpper/innerLower are MOSFETs: gated on they conduct both ways, so a lost
  // body diode is covered by the channel in every pattern that gates it.
  'anpc-hybrid': {
    outerUpper: { P: [0, 1], 'O-lower': [0, 0], 'O-upper': [0, 0], N: [-1, -1] },
    'outerUpper.diode': { P: [1, null], 'O-lower': [0, 0], 'O-upper': [0, 0], N: [-1, -1] },
    innerUpper: { P: [0, 1], 'O-lower': [0, 0], 'O-upper': [-1, 0], N: [-1, -1] }, // O-upper, i>0: only N via innerLower body diode
    'innerUpper.diode': { P: [1, 1], 'O-lower': [0, 0], 'O-upper': [0, 0], N: [-1, -1] }, // channel conducts out→X where gated
    innerLower: { P: [1, 1], 'O-lower': [0, 1], 'O-upper': [0, 0], N: [-1, 0] }, // i<0 only via X
    'innerLower.diode': { P: [1, 1], 'O-lower': [0, 0], 'O-upper': [0, 0], N: [-1, -1] }, // channel conducts Y→out where gated
    outerLower: { P: [1, 1], 'O-lower': [0, 0], 'O-upper': [0, 0], N: [-1, 0] },
    'outerLower.diode': { P: [1, 1], 'O-lower': [0, 0], 'O-upper': [0, 0], N: [null, -1] },
    clampUpper: { P: [1, 1], 'O-lower': [0, 0], 'O-upper': [0, 1], N: [-1, -1] },
    'clampUpper.diode': { P: [1, 1], 'O-lower': [0, 0], 'O-upper': [-1, 0], N: [-1, -1] },
    clampLower: { P: [1, 1], 'O-lower': [-1, 0], 'O-upper': [0, 0], N: [-1, -1] },
    'clampLower.diode': { P: [1, 1], 'O-lower': [0, 1], 'O-upper': [0, 0], N: [-1, -1] },
  },
  // out fed by P (upper on), N (lower.diode), M (outToNeutral.diode); drains to P (upper.diode),
  // N (lower on), M (outToNeutral on). M fed by O (neutralToOut on); M drains to O (neutralToOut.diode).
  tnpc: {
    upper: { P: [0, 1], O: [0, 0], N: [-1, -1] }, // P, i>0: O through the neutral branch
    'upper.diode': { P: [1, null], O: [0, 0], N: [-1, -1] }, // P, i<0: outToNeutral off, nowhere to go
    lower: { P: [1, 1], O: [0, 0], N: [-1, 0] }, // N, i<0: neutral branch to O
    'lower.diode': { P: [1, 1], O: [0, 0], N: [null, -1] }, // N, i>0: neutralToOut off, nothing feeds out
    neutralToOut: { P: [1, 1], O: [-1, 0], N: [-1, -1] }, // O lost for i>0 only
    'neutralToOut.diode': { P: [1, 1], O: [0, 1], N: [-1, -1] }, // O lost for i<0 only
    outToNeutral: { P: [1, 1], O: [0, 1], N: [-1, -1] }, // O lost for i<0 only
    'outToNeutral.diode': { P: [1, 1], O: [-1, 0], N: [-1, -1] }, // O lost for i>0 only
  },
};

function rowOf(topology: BuiltinTopology, faults: string[], ignoreRatings = true): Row {
  const t = analyseLeg({ topology, faults, ignoreRatings }).phases.a;
  const out: Row = {};
  for (const p of t.patterns) {
    if (p.status !== 'allowed') throw new Error(`${p.name} forbidden`);
    out[p.name] = [p.bySign['+'].level, p.bySign['-'].level];
  }
  return out;
}

describe('legTable', () => {
  it.each(BUILTIN_TOPOLOGIES)('gives the healthy table of %s, with and without the ratings', (topology) => {
    expect(rowOf(topology, [])).toEqual(HEALTHY[topology]);
    expect(rowOf(topology, [], false)).toEqual(HEALTHY[topology]);
  });

  it.each(BUILTIN_TOPOLOGIES)('covers every element of %s in the hand-worked fault list', (topology) => {
    expect(Object.keys(FAULTED[topology]).sort()).toEqual(
      expandElements(builtinLeg(topology))
        .map((e) => e.id)
        .sort(),
    );
  });

  const cases = BUILTIN_TOPOLOGIES.flatMap((t) => Object.entries(FAULTED[t]).map(([el, row]) => [t, el, row] as const));
  // these are the first version's tables: conduction alone, ratings ignored
  it.each(cases)('matches the hand-worked table of %s with %s open (ratings ignored)', (topology, element, row) => {
    expect(rowOf(topology, [`a.${element}`])).toEqual(row);
  });

  it('derives level sets from the patterns: union per sign, robust = same level for both signs', () => {
    const t = legTable(builtinLeg('npc'), new Map([['outerUpper', 'open']]));
    expect(t.levels).toEqual({ '+': [-1, 0], '-': [-1, 0, 1], '?': [-1, 0] });
  });

  it('marks the elements carrying the current', () => {
    const t = legTable(builtinLeg('npc'), new Map());
    const p = t.patterns.find((x) => x.name === 'P');
    expect(p?.status).toBe('allowed');
    if (p?.status !== 'allowed') return;
    expect(p.bySign['+'].path).toEqual(['outerUpper', 'innerUpper']);
    expect(p.bySign['-'].path).toEqual(['outerUpper.diode', 'innerUpper.diode']);
    expect(p.bySign['+'].dcNodes).toEqual(['P']);
  });

  it('forbids a shoot-through pattern and names the path', () => {
    const leg = { ...builtinLeg('two-level'), patterns: { P: ['upper'], both: ['upper', 'lower'] } };
    const t = legTable(leg, new Map());
    const both = t.patterns.find((p) => p.name === 'both');
    expect(both).toMatchObject({ status: 'forbidden', shootThrough: { from: 'P', to: 'N', path: ['upper', 'lower'] } });
    expect(t.levels['+']).toEqual([1]); // a forbidden pattern contributes no level
  });

  it('makes a shorted element conduct both ways', () => {
    // lower shorted: pattern P now joins P to N through upper and the short
    const t = legTable(builtinLeg('two-level'), new Map([['lower', 'short']]));
    expect(t.patterns[0]).toMatchObject({ status: 'forbidden', shootThrough: { from: 'P', to: 'N' } });
    expect(t.patterns[1]).toMatchObject({ status: 'allowed', bySign: { '+': { level: -1 }, '-': { level: -1 } } });
  });
});
