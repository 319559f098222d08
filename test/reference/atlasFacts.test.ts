import { describe, expect, it } from 'vitest';
import { faultAtlas } from '@hexsalvage/core';

// Facts of the trade about open faults in a three-level NPC leg, checked against the fault atlas.

describe('severity of open switch faults in an NPC leg', () => {
  it('inner-switch open faults are the most severe open switch faults at low load angle, outer-switch open faults the mildest (common practice)', () => {
    // Common practice in fault-tolerant NPC work: an open outer switch only removes P (or N) for one
    // current sign, the inner switch carries the current of two levels (P and O for i > 0), so its
    // loss is the graver; at low load angle (near unity power factor) the difference is widest.
    const a = faultAtlas({ topology: 'npc', modes: ['open'], loadAngleRangeDeg: [-10, 10], stepDeg: 5 });
    const at = (f: string) => a.entries.find((e) => e.faults[0] === `a.${f}:open`)!.mMaxMin;
    const switches = ['outerUpper', 'innerUpper', 'innerLower', 'outerLower'];
    const worst = Math.min(...switches.map(at));
    const mildest = Math.max(...switches.map(at));
    expect(at('innerUpper')).toBe(worst);
    expect(at('innerLower')).toBe(worst);
    expect(at('outerUpper')).toBe(mildest);
    expect(at('outerLower')).toBe(mildest);
    expect(mildest).toBeGreaterThan(worst);
    // pinned value, not a published figure: an outer open fault leaves half the healthy 2/√3 there
    expect(mildest).toBeCloseTo(1 / Math.sqrt(3), 12);
  });
});
