import { describe, expect, it } from 'vitest';
import { builtinLeg, switchingTable, type LegNetlist } from '@hexsalvage/core';
import { expandElements, ratingCheck } from '@hexsalvage/core/internal';

// Facts of the trade behind the Version 2 rules, checked against the solver.

// The same leg with every rating scaled, to find how much each state asks of its devices.
function rated(leg: LegNetlist, factor: number): LegNetlist {
  return { ...leg, devices: leg.devices.map((d) => ({ ...d, rating: (d.rating as number) * factor })) };
}

describe('device stress and switching sequences of a healthy NPC leg', () => {
  it('each device blocks half the link in healthy operation (Bin Wu, High-Power Converters and AC Drives, 2006, ch. 8, from memory)', () => {
    // every state of the healthy leg is within a rating of Vdc/2 (units of Vdc/2: 1) …
    const npc = builtinLeg('npc');
    const elements = expandElements(npc);
    const states: [string[], number][] = [
      [['outerUpper', 'innerUpper'], 1],
      [['innerUpper', 'innerLower'], 0],
      [['innerLower', 'outerLower'], -1],
    ];
    for (const [gates, level] of states) expect(ratingCheck(npc, elements, new Set(gates), new Map(), level)).toEqual({ ok: true });
    // … and no less: at 0.99 × Vdc/2 the P and N states fail, each naming a device blocking Vdc/2
    const tight = rated(npc, 0.99);
    const tightElements = expandElements(tight);
    for (const [gates, level] of [states[0], states[2]] as [string[], number][]) {
      const r = ratingCheck(tight, tightElements, new Set(gates), new Map(), level);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.voltage).toBe(1);
    }
  });

  it('a switching sequence changes one phase by one level at a time (same source, from memory)', () => {
    const t = switchingTable({ topology: 'npc', levelSteps: 'adjacent' });
    let steps = 0;
    for (const p of Object.values(t.polarities))
      for (const tri of p.tableTriangles) {
        const s = tri.sequence;
        expect(s).not.toBeNull();
        for (let k = 0; k < 2; k++) {
          const a = s!.states[k]!.map((x) => x.level);
          const b = s!.states[k + 1]!.map((x) => x.level);
          const changed = [0, 1, 2].filter((i) => a[i] !== b[i]);
          expect(changed.length).toBe(1);
          expect(Math.abs((a[changed[0]!] as number) - (b[changed[0]!] as number))).toBe(1);
          steps++;
        }
      }
    expect(steps).toBe(2 * 25 * 24);
    expect(t.flags.levelJumps).toEqual([]);
  });

  it('two-level and T-type outer devices block the whole link (common practice): ratings of 2 hold, 1.99 does not', () => {
    for (const [id, gates, level] of [
      ['two-level', ['upper'], 1],
      ['tnpc', ['upper', 'neutralToOut'], 1],
    ] as const) {
      const leg = builtinLeg(id);
      expect(ratingCheck(leg, expandElements(leg), new Set(gates), new Map(), level).ok).toBe(true);
      const tight = { ...leg, devices: leg.devices.map((d) => ({ ...d, rating: d.rating === 2 ? 1.99 : d.rating })) };
      const r = ratingCheck(tight, expandElements(tight), new Set(gates), new Map(), level);
      expect(r).toMatchObject({ ok: false, voltage: 2 });
    }
  });
});
