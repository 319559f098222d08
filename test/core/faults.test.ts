import { describe, expect, it } from 'vitest';
import { analyseLeg, builtinLeg, HexsalvageInputError, parseFault } from '@hexsalvage/core';
import { faultsByPhase } from '@hexsalvage/core/internal';

describe('parseFault', () => {
  const npc = builtinLeg('npc');
  const anpc = builtinLeg('anpc');
  it('reads PHASE.DEVICE with open as the default mode', () => {
    expect(parseFault('a.outerUpper', npc)).toEqual({ phase: 'a', element: 'outerUpper', mode: 'open' });
  });
  it('reads a diode element and an explicit mode', () => {
    expect(parseFault('b.clampLower.diode:open', anpc)).toEqual({ phase: 'b', element: 'clampLower.diode', mode: 'open' });
    expect(parseFault('c.upper:short', builtinLeg('two-level'))).toEqual({ phase: 'c', element: 'upper', mode: 'short' });
  });
  it.each([
    ['d.outerUpper', 'a phase, one of a, b, c'],
    ['outerUpper', 'PHASE.DEVICE[:MODE]'],
    ['a.outerUper', 'one of outerUpper, outerUpper.diode, innerUpper'],
    ['a.clampUpper.diode', 'one of outerUpper'], // npc clamps are plain diodes: no .diode element
    ['a.outerUpper:stuck', 'a fault mode, one of open, short'],
  ])('rejects %s and lists the valid choices', (text, hint) => {
    expect(() => parseFault(text, npc)).toThrow(HexsalvageInputError);
    expect(() => parseFault(text, npc)).toThrow(hint);
  });
});

describe('faultsByPhase', () => {
  it('groups several faults in several phases', () => {
    const g = faultsByPhase(['a.outerUpper', 'a.innerLower.diode', 'c.clampUpper'], builtinLeg('npc'));
    expect([...g.a]).toEqual([
      ['outerUpper', 'open'],
      ['innerLower.diode', 'open'],
    ]);
    expect(g.b.size).toBe(0);
    expect([...g.c]).toEqual([['clampUpper', 'open']]);
  });
  it('rejects one element given two modes', () => {
    expect(() => faultsByPhase(['a.upper:open', 'a.upper:short'], builtinLeg('two-level'))).toThrow('one mode per device');
  });
});

describe('analyseLeg', () => {
  it('applies faults in their own phase only', () => {
    const a = analyseLeg({ topology: 'npc', faults: ['b.outerUpper'] });
    expect(a.phases.a).toBe(a.healthy);
    expect(a.phases.b.levels['+']).toEqual([-1, 0]);
    expect(a.phases.c).toBe(a.healthy);
  });
  it('rejects an unknown topology naming the built-ins', () => {
    expect(() => analyseLeg({ topology: 'npc5' })).toThrow('two-level, npc, anpc, anpc-hybrid, tnpc');
  });
});
