import { describe, expect, it } from 'vitest';
import {
  analyseLeg,
  BUILTIN_TOPOLOGIES,
  builtinLeg,
  cycleCheck,
  parsePolarity,
  switchingTable,
  type BuiltinTopology,
  type PhaseFaults,
} from '@hexsalvage/core';
import { midpointSign, conductionEdges, diagramAtlas, expandElements, outputForSign, planFromAtlas, switchingTableFromAtlas } from '@hexsalvage/core/internal';

// Re-solves one phase state with the leg solver: the level the pattern really gives for the sign.
function solvedLevel(topology: BuiltinTopology, faults: PhaseFaults, gates: readonly string[], sign: '+' | '-') {
  const leg = builtinLeg(topology);
  return outputForSign(leg, conductionEdges(expandElements(leg), new Set(gates), faults), sign).level;
}

const CASES: [BuiltinTopology, string[]][] = BUILTIN_TOPOLOGIES.flatMap((t) => [
  [t, []] as [BuiltinTopology, string[]],
  ...expandElements(builtinLeg(t)).map((e) => [t, [`a.${e.id}`]] as [BuiltinTopology, string[]]),
]);

describe('switchingTable', () => {
  it.each(CASES)('realises every vertex of %s with faults %j through the leg solver', (topology, faults) => {
    const table = switchingTable({ topology, faults });
    const analysis = analyseLeg({ topology, faults });
    const phaseFaults = (k: number) => new Map(analysis.faults.filter((f) => f.phase === 'abc'[k]).map((f) => [f.element, f.mode] as const));
    for (const pol of table.polarityOrder) {
      const signs = parsePolarity(pol);
      for (const tri of table.polarities[pol]!.tableTriangles) {
        const states = [...tri.vertices.flatMap((v) => v.realisations.map((r) => r.phases)), ...(tri.sequence?.states ?? [])];
        for (const st of states) {
          st.forEach((ps, k) => {
            const s = signs[k]!;
            // `?` phases must use a pattern that gives the level for both signs (robust)
            for (const sign of s === '?' ? (['+', '-'] as const) : [s]) expect(solvedLevel(topology, phaseFaults(k), ps.gates, sign)).toBe(ps.level);
            const p = analysis.phases['abc'[k] as 'a'].patterns.find((x) => x.name === ps.pattern);
            expect(p?.status).toBe('allowed');
          });
        }
        // the realisations really are the vertex's triplets
        for (const v of tri.vertices) for (const r of v.realisations) expect(r.phases.map((p) => p.level)).toEqual([...r.levels]);
        expect(tri.sequence).not.toBeNull();
      }
    }
  });

  it('puts the neutral-point current of a healthy NPC where the textbook does', () => {
    // Source: B. Wu, "High-Power Converters and AC Drives", Wiley-IEEE Press 2006, ch. 8 (NPC
    // neutral-point voltage deviation, from memory): a P-type small vector POO draws i_NP = i_b + i_c
    // = −i_a, its N-type twin ONN draws i_NP = i_a, the medium vector PON draws i_b, zero and large
    // vectors draw none.
    const t = switchingTable({ topology: 'npc' });
    const all = t.polarities['+--']!.tableTriangles.flatMap((tri) => tri.vertices.flatMap((v) => v.realisations));
    const coeff = (levels: number[]) => all.find((r) => r.levels.join() === levels.join())!.midpoint;
    expect(coeff([1, 0, 0])).toEqual([0, 1, 1]);
    expect(coeff([0, -1, -1])).toEqual([1, 0, 0]);
    expect(coeff([1, 0, -1])).toEqual([0, 1, 0]);
    expect(coeff([1, -1, -1])).toEqual([0, 0, 0]);
    expect(coeff([0, 0, 0])).toEqual([1, 1, 1]);
    // with i_a > 0 the two small-vector twins push the midpoint opposite ways: full authority. The
    // sign is that of the current into the midpoint node (contract, Version 3): POO feeds −(i_b + i_c)
    // = i_a > 0 into it, ONN takes i_a out of it
    const r100 = all.find((r) => r.levels.join() === '1,0,0')!;
    const r0nn = all.find((r) => r.levels.join() === '0,-1,-1')!;
    expect([r100.midpointSign, r0nn.midpointSign]).toEqual([1, -1]);
  });

  it('gives a healthy NPC sequences that move one phase by one level per step', () => {
    // Common practice (e.g. B. Wu 2006, ch. 8, from memory): nearest-three-vector sequences of the
    // NPC change one phase by one level at each step, so no device switches across the full link.
    const t = switchingTable({ topology: 'npc' });
    for (const pol of t.polarityOrder)
      for (const tri of t.polarities[pol]!.tableTriangles) {
        const st = tri.sequence!.states;
        expect(tri.sequence!.levelJumps).toEqual([]);
        for (let s = 0; s < 2; s++) {
          const moved = [0, 1, 2].filter((k) => st[s]![k]!.level !== st[s + 1]![k]!.level);
          expect(moved).toHaveLength(1);
          expect(Math.abs(st[s]![moved[0]!]!.level - st[s + 1]![moved[0]!]!.level)).toBe(1);
        }
      }
  });

  it('keeps the line-frequency IGBTs of a healthy hybrid ANPC at line rate and flags them after a SiC fault', () => {
    expect(switchingTable({ topology: 'anpc-hybrid' }).flags.lineDevicesAtPwm).toEqual([]);
    const f = switchingTable({ topology: 'anpc-hybrid', faults: ['a.innerUpper'] }).flags.lineDevicesAtPwm;
    expect(f.length).toBeGreaterThan(0);
    expect(f.every((x) => x.detail.every((d) => /^a\.(outer|clamp)(Upper|Lower)$/.test(d)))).toBe(true);
  });

  it('lists the triangles where midpoint control is lost after the fault', () => {
    expect(switchingTable({ topology: 'npc' }).flags.midpointAuthorityLost).toEqual([]);
    const t = switchingTable({ topology: 'tnpc', faults: ['a.neutralToOut'] });
    expect(t.flags.midpointAuthorityLost.length).toBeGreaterThan(0);
  });
});

describe('cycleCheck', () => {
  it('holds volt-second balance in every period and finds a healthy NPC balanced', () => {
    const r = cycleCheck(switchingTable({ topology: 'npc' }), { m: 1.1, loadAngleDeg: 30, frequencyRatio: 180, currentAmplitude: 100 });
    expect(r.voltSecondErrorMax).toBeLessThan(1e-12);
    expect(r.clampedPeriods).toBe(0);
    expect(r.midpointDrift).toBe(false);
    expect(r.midpointCurrent.reachable![0]).toBeLessThan(0);
    expect(r.midpointCurrent.reachable![1]).toBeGreaterThan(0);
  });

  it('flags midpoint drift when a T-type neutral switch fault leaves one direction only', () => {
    const r = cycleCheck(switchingTable({ topology: 'tnpc', faults: ['a.neutralToOut'] }), { m: 1.1, loadAngleDeg: 80, frequencyRatio: 240 });
    expect(r.midpointDrift).toBe(true);
    // the current into the midpoint node can only be positive here (contract, Version 3 sign)
    expect(r.midpointCurrent.reachable![0]).toBeGreaterThan(0);
  });

  it('counts gate changes per fundamental, line devices of a healthy hybrid leg about twice per cycle', () => {
    const r = cycleCheck(switchingTable({ topology: 'anpc-hybrid' }), { m: 1, loadAngleDeg: 20, frequencyRatio: 200 });
    for (const dev of ['outerUpper', 'outerLower', 'clampUpper', 'clampLower']) expect(r.gateChangesPerCycle[`a.${dev}`]).toBeLessThanOrEqual(4);
    expect(r.gateChangesPerCycle['a.innerUpper']).toBeGreaterThan(100);
  });

  it('clamps and counts references beyond the limit', () => {
    const atlas = diagramAtlas({ topology: 'npc', faults: ['a.outerUpper'] });
    const plan = planFromAtlas(atlas, 0, 0);
    const r = cycleCheck(switchingTableFromAtlas(atlas), { m: plan.mMax * 1.3, frequencyRatio: 120 });
    expect(r.clampedPeriods).toBeGreaterThan(0);
  });

  it.each([
    [{ m: -1 }, 'm'],
    [{ m: 0.5, frequencyRatio: 3 }, 'frequencyRatio'],
    [{ m: 0.5, currentAmplitude: 0 }, 'currentAmplitude'],
  ])('rejects %j', (opt, key) => {
    expect(() => cycleCheck(switchingTable({ topology: 'npc' }), opt)).toThrow(key);
  });
});

describe('midpointSign', () => {
  it('resolves an unknown phase where the three currents summing to zero decide (current into the midpoint node)', () => {
    // one phase at the midpoint: minus its own sign, unknown when it reads ?
    expect(midpointSign([1, 0, 0], ['+', '-', '?'])).toBe(-1);
    expect(midpointSign([1, 0, 0], ['?', '-', '+'])).toBeNull();
    // two at the midpoint: −(i_a + i_b) = i_c, from the third phase when known …
    expect(midpointSign([1, 1, 0], ['?', '?', '+'])).toBe(1);
    // … or, the third reading ?, from the two when they share one known sign
    expect(midpointSign([1, 1, 0], ['+', '+', '?'])).toBe(-1);
    expect(midpointSign([1, 1, 0], ['-', '-', '?'])).toBe(1);
    expect(midpointSign([1, 1, 0], ['+', '-', '?'])).toBeNull();
    expect(midpointSign([0, 0, 0], ['?', '?', '?'])).toBe(0);
  });
});
