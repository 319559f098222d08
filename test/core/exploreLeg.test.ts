import { describe, expect, it } from 'vitest';
import { analyseLeg, builtinLeg, exploreLeg } from '@hexsalvage/core';

describe('exploreLeg', () => {
  it('drops shoot-through and overstressing combinations and finds no extra level on a healthy ANPC leg', () => {
    const x = exploreLeg(analyseLeg({ topology: 'anpc' }));
    expect(x.ok).toBe(true);
    if (!x.ok) return;
    expect(x.phases.a.combinations).toBe(64);
    expect(x.phases.a.shootThrough).toBeGreaterThan(0);
    // e.g. {outerUpper, innerLower} with i<0: out drains to N through innerLower while X sits at P,
    // so innerUpper would block the whole link (the static check of contract Version 2)
    expect(x.phases.a.overstressed).toBeGreaterThan(0);
    expect(x.phases.a.extraLevels).toEqual({ '+': [], '-': [], '?': [] });
  });

  it('uses the same static check as the leg table: ignoring ratings drops nothing for overstress', () => {
    const x = exploreLeg(analyseLeg({ topology: 'anpc', ignoreRatings: true }));
    if (!x.ok) throw new Error(x.reason);
    expect(x.phases.a.overstressed).toBe(0);
    const npc = analyseLeg({ topology: 'npc', faults: ['a.innerUpper'] });
    const p = npc.phases.a.patterns.find((q) => q.name === 'P');
    // the named pattern's verdict and the solver's verdict for the same gate set are one and the same
    const o = npc.phases.a.solve(['outerUpper', 'innerUpper']);
    expect(p?.status === 'allowed' && p.bySign['+'].level).toBe(null);
    expect(o.status === 'allowed' && o.bySign['+'].level).toBe(null);
    expect(o.status === 'allowed' && typeof o.unsafe['+']).toBe('string');
  });

  it('finds the zero level a sparse pattern list misses once a clamp path fails', () => {
    // A user lists only O-upper for the zero level. With clampUpper open, O-upper loses O for
    // i<0, but the hardware can still reach O through clampLower: exploration must say so.
    const leg = {
      ...builtinLeg('anpc'),
      patterns: { P: ['outerUpper', 'innerUpper', 'clampLower'], 'O-upper': ['clampUpper', 'innerUpper'], N: ['innerLower', 'outerLower', 'clampUpper'] },
    };
    const a = analyseLeg({ topology: leg, faults: ['a.clampUpper'] });
    expect(a.phases.a.levels['-']).toEqual([-1, 1]);
    const x = exploreLeg(a);
    if (!x.ok) throw new Error(x.reason);
    expect(x.phases.a.extraLevels['-']).toContain(0);
    expect(x.phases.a.extraCombinations.some((c) => c['-'] === 0 && c.gates.includes('clampLower'))).toBe(true);
  });

  it('reports too many switches as data', () => {
    const devices = Array.from({ length: 17 }, (_, i) => ({
      id: `s${i}`,
      kind: 'igbt' as const,
      from: i === 0 ? 'P' : `n${i}`,
      to: i === 16 ? 'out' : `n${i + 1}`,
    }));
    const leg = {
      name: 'long',
      dcNodes: { P: 1, N: -1 },
      output: 'out',
      devices: [...devices, { id: 'd', kind: 'diode' as const, from: 'N', to: 'out' }],
      patterns: { on: devices.map((d) => d.id) },
    };
    const x = exploreLeg(analyseLeg({ topology: leg }));
    expect(x).toMatchObject({ ok: false });
  });
});
