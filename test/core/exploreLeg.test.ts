import { describe, expect, it } from 'vitest';
import { analyseLeg, blockingBudget, blockingVoltages, builtinLeg, conductionEdges, expandElements, exploreLeg, outputForSign } from '@hexsalvage/core';

describe('blockingVoltages', () => {
  it('finds an ANPC leg with every switch off unclamped', () => {
    // All off, i>0: the output sits at N through innerLower/outerLower diodes. X is held only
    // between O (clampUpper.diode O→X) and P (outerUpper.diode X→P), so innerUpper, between X and
    // the output, may have to block up to P−N = 2 steps: the node X is unclamped.
    const leg = builtinLeg('anpc');
    const edges = conductionEdges(expandElements(leg), new Set(), new Map());
    const out = outputForSign(leg, edges, '+');
    expect(out.level).toBe(-1);
    const v = blockingVoltages(leg, edges, -1);
    expect(v.get('innerUpper')).toBe(2);
    expect(v.get('innerLower')).toBe(0);
    expect(v.get('outerLower')).toBe(0);
  });

  it('shows the NPC P state clamps the outer lower switch but not the inner one', () => {
    // P state, i>0: out = X = P. Y is held below O by clampLower (Y→O) and above N by the
    // outerLower diode, so outerLower blocks at most one step while innerLower, between P and Y,
    // may block up to two: static sharing there rests on leakage, which the bounds do not assume.
    const leg = builtinLeg('npc');
    const edges = conductionEdges(expandElements(leg), new Set(['outerUpper', 'innerUpper']), new Map());
    const v = blockingVoltages(leg, edges, 1);
    expect(v.get('outerLower')).toBe(1);
    expect(v.get('innerLower')).toBe(2);
    expect(v.get('clampLower')).toBe(1);
    // …which is why the exploration budget of a device is what the leg's own patterns ask of it
    expect(blockingBudget(leg).get('innerLower')).toBe(2);
    expect(blockingBudget(leg).get('outerLower')).toBe(1);
  });
});

describe('blockingBudget', () => {
  it('gives the T-type outer switches the full link and the neutral branch one step', () => {
    const b = blockingBudget(builtinLeg('tnpc'));
    expect(b.get('upper')).toBe(2);
    expect(b.get('lower')).toBe(2);
    expect(b.get('neutralToOut')).toBe(1);
    expect(b.get('outToNeutral')).toBe(1);
  });
});

describe('exploreLeg', () => {
  it('drops shoot-through and unclamped combinations and finds no extra level on a healthy ANPC leg', () => {
    const x = exploreLeg(analyseLeg({ topology: 'anpc' }));
    expect(x.ok).toBe(true);
    if (!x.ok) return;
    expect(x.phases.a.combinations).toBe(64);
    expect(x.phases.a.shootThrough).toBeGreaterThan(0);
    expect(x.phases.a.unclamped).toBeGreaterThan(0);
    expect(x.phases.a.extraLevels).toEqual({ '+': [], '-': [], '?': [] });
  });

  it('finds the zero level a sparse pattern list misses once a clamp path fails', () => {
    // A user lists only O-upper for the zero level. With clampUpper open, O-upper loses O for
    // i<0, but the hardware can still reach O through clampLower: exploration must say so.
    const leg = { ...builtinLeg('anpc'), patterns: { P: ['outerUpper', 'innerUpper', 'clampLower'], 'O-upper': ['clampUpper', 'innerUpper'], N: ['innerLower', 'outerLower', 'clampUpper'] } };
    const a = analyseLeg({ topology: leg, faults: ['a.clampUpper'] });
    expect(a.phases.a.levels['-']).toEqual([-1, 1]);
    const x = exploreLeg(a);
    if (!x.ok) throw new Error(x.reason);
    expect(x.phases.a.extraLevels['-']).toContain(0);
    expect(x.phases.a.extraCombinations.some((c) => c['-'] === 0 && c.gates.includes('clampLower'))).toBe(true);
  });

  it('reports too many switches as data', () => {
    const devices = Array.from({ length: 17 }, (_, i) => ({ id: `s${i}`, kind: 'igbt' as const, from: i === 0 ? 'P' : `n${i}`, to: i === 16 ? 'out' : `n${i + 1}` }));
    const leg = { name: 'long', dcNodes: { P: 1, N: -1 }, output: 'out', devices: [...devices, { id: 'd', kind: 'diode' as const, from: 'N', to: 'out' }], patterns: { on: devices.map((d) => d.id) } };
    const x = exploreLeg(analyseLeg({ topology: leg }));
    expect(x).toMatchObject({ ok: false });
  });
});
