import { describe, expect, it } from 'vitest';
import { analyseLeg } from '@hexsalvage/core';

// Facts of the trade about single open-circuit faults, checked against the solver.

describe('analyseLeg against published fault behaviour', () => {
  it('NPC: an open outer switch loses the positive level only while the phase current is positive', () => {
    // Source: S. Li and L. Xu, "Strategies of fault tolerant operation for three-level PWM
    // inverters", IEEE Trans. Power Electronics 21(4), 2006 (from memory): with the outer upper
    // switch open, positive current in the P state commutates to the upper clamp diode (output O),
    // negative current still returns through the outer switch's antiparallel diode. Common practice.
    const a = analyseLeg({ topology: 'npc', faults: ['a.outerUpper'] }).phases.a.levels;
    expect(a['+']).not.toContain(1);
    expect(a['-']).toContain(1);
    expect(a['+']).toEqual([-1, 0]);
  });

  it('ANPC: an open clamp switch leaves the zero level available through the other clamp path', () => {
    // Source: T. Brückner, S. Bernet and H. Güldner, "The active NPC converter and its
    // loss-balancing control", IEEE Trans. Industrial Electronics 52(3), 2005 (from memory): the
    // zero state has an upper and a lower path through the two clamp switches, redundant for both
    // current directions.
    for (const f of ['clampUpper', 'clampLower']) {
      const a = analyseLeg({ topology: 'anpc', faults: [`a.${f}`] }).phases.a.levels;
      expect(a['+']).toContain(0);
      expect(a['-']).toContain(0);
      expect(a['?']).toContain(0);
    }
  });

  it('T-type: a neutral-branch switch fault loses the zero level for one current sign only', () => {
    // Source: U.-M. Choi, F. Blaabjerg and K.-B. Lee, "Reliability improvement of a T-type
    // three-level inverter with fault-tolerant control strategy", IEEE Trans. Power Electronics
    // 30(5), 2015 (from memory): each neutral-branch IGBT carries the zero-state current of one
    // direction; the other direction flows through its partner and the antiparallel diode.
    const nto = analyseLeg({ topology: 'tnpc', faults: ['a.neutralToOut'] }).phases.a.levels;
    expect(nto['+']).not.toContain(0);
    expect(nto['-']).toContain(0);
    const otn = analyseLeg({ topology: 'tnpc', faults: ['a.outToNeutral'] }).phases.a.levels;
    expect(otn['+']).toContain(0);
    expect(otn['-']).not.toContain(0);
  });

  it('two-level: an open switch leaves its diode, so the lost level depends on the current sign', () => {
    // Common practice (e.g. B. Wu, "High-Power Converters and AC Drives", Wiley-IEEE Press 2006,
    // two-level VSI chapter, from memory): an open upper switch still lets negative current
    // return to P through its freewheeling diode.
    const a = analyseLeg({ topology: 'two-level', faults: ['a.upper'] }).phases.a.levels;
    expect(a).toEqual({ '+': [-1], '-': [-1, 1], '?': [-1] });
  });
});
