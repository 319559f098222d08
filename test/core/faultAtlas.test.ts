import { describe, expect, it } from 'vitest';
import { BUILTIN_TOPOLOGIES, builtinLeg, evaluateClaim, faultAtlas, HexsalvageInputError, planRemedial, type LegNetlist } from '@hexsalvage/core';
import { atlasWork, canonicalRotation, expandElements } from '@hexsalvage/core/internal';
import { fc, fcParams } from '../support/fc.js';

const S3 = Math.sqrt(3);

describe('faultAtlas: every entry is what plan and check give for that fault', () => {
  it('equals check (exact minimum over the range) and plan (the curve) for every single fault of every built-in leg (property over ranges and margins)', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...BUILTIN_TOPOLOGIES),
        fc.integer({ min: -180, max: 170 }),
        fc.integer({ min: 5, max: 120 }),
        fc.constantFrom(0, 3, 10),
        fc.constantFrom('commutable', 'adjacent', 'any'),
        (topology, lo, width, margin, levelSteps) => {
          const hi = Math.min(180, lo + width);
          const a = faultAtlas({ topology, loadAngleRangeDeg: [lo, hi], stepDeg: 15, polarityMarginDeg: margin, levelSteps });
          expect(a.entries).toHaveLength(expandElements(builtinLeg(topology)).length * 2);
          for (const e of a.entries) {
            const v = evaluateClaim({ name: 'x', topology, faults: e.faults, m: 0, loadAngleDeg: [lo, hi], polarityMarginDeg: margin, levelSteps });
            expect(e.mMaxMin).toBe(v.mMaxAtWorst);
            expect(e.worstLoadAngleDeg).toBe(v.worstLoadAngleDeg);
            expect(e.mMaxHullMin).toBe(v.mMaxHullAtWorst);
            for (const [phi, m] of e.mMaxAt) {
              expect(m).toBe(planRemedial({ topology, faults: e.faults, loadAngleDeg: phi, polarityMarginDeg: margin, levelSteps }).mMax);
              // the exact minimum is never above a grid value
              expect(e.mMaxMin).toBeLessThanOrEqual(m + 1e-12);
            }
          }
        },
      ),
      fcParams(12),
    );
  });

  it('gives the verdicts by their definitions and lists worst first', () => {
    const a = faultAtlas({ topology: 'anpc' });
    for (const e of a.entries) {
      const expected = e.mMaxMin <= 1e-9 ? 'cannot-run' : e.mMaxMin >= a.healthy.mMaxMin - 1e-9 ? 'full' : 'derated';
      expect(e.verdict).toBe(expected);
      expect(e.deratingRatio).toBeCloseTo(e.mMaxMin / a.healthy.mMaxMin, 15);
      if (e.verdict === 'cannot-run') expect(e.reason).toMatch(/^cannot run: /);
    }
    for (let i = 1; i < a.entries.length; i++) expect(a.entries[i]!.mMaxMin).toBeGreaterThanOrEqual(a.entries[i - 1]!.mMaxMin);
    expect(a.healthy.mMaxMin).toBeCloseTo(2 / S3, 12);
    // the grid: −90…90 by 5 (37 points), and HI itself when the step does not land on it
    expect(a.healthy.mMaxAt.map(([phi]) => phi)).toEqual(Array.from({ length: 37 }, (_, k) => -90 + 5 * k));
    expect(faultAtlas({ topology: 'two-level', loadAngleRangeDeg: [0, 10], stepDeg: 4 }).healthy.mMaxAt.map(([phi]) => phi)).toEqual([0, 4, 8, 10]);
  });

  it('adds volts by the contract formulas when vdc is given', () => {
    const a = faultAtlas({ topology: 'npc', modes: ['open'], vdc: 750 });
    expect(a.volts?.phasePeakMaxHealthy).toBeCloseTo((2 / S3) * 375, 9);
    expect(a.volts?.lineRmsMaxHealthy).toBeCloseTo((2 / S3) * 375 * Math.sqrt(1.5), 9);
    for (const e of a.entries) expect(e.volts?.lineRmsMin).toBeCloseTo(e.mMaxMin * 375 * Math.sqrt(1.5), 9);
  });

  it('refuses bad options with a typed error naming the key', () => {
    const bad: [object, string][] = [
      [{ topology: 'npc', modes: [] }, 'modes'],
      [{ topology: 'npc', modes: ['open', 'open'] }, 'modes'],
      [{ topology: 'npc', modes: ['melted'] }, 'modes'],
      [{ topology: 'npc', loadAngleRangeDeg: [10, -10] }, 'loadAngleRangeDeg[1]'],
      [{ topology: 'npc', loadAngleRangeDeg: [0] }, 'loadAngleRangeDeg'],
      [{ topology: 'npc', stepDeg: 0 }, 'stepDeg'],
      [{ topology: 'npc', stepDeg: 1e-3 }, 'stepDeg'],
      [{ topology: 'npc', polarityMarginDeg: 60 }, 'polarityMarginDeg'],
      [{ topology: 'npc', vdc: -5 }, 'vdc'],
      [{ topology: 'npc', pairs: 'yes' }, 'pairs'],
    ];
    for (const [o, key] of bad) {
      expect(() => faultAtlas(o as never)).toThrow(HexsalvageInputError);
      expect(() => faultAtlas(o as never)).toThrow(key);
    }
  });
});

describe('faultAtlas: symmetries', () => {
  it('phase rotation: a fault set moved to other phases has the same limit at every load angle', () => {
    // What holds exactly: mMax is a minimum over a whole revolution of the reference, and turning
    // the faults a→b→c turns the diagrams and the current polarity pattern together by 120°, so
    // mMax(φ) is unchanged (to rounding) and so is everything the atlas lists. The reference angle
    // where the limit binds turns by 120° as well, but it is not listed: the minimum is often
    // reached at several angles (the sector pattern repeats), and the one reported may be another.
    for (const t of ['npc', 'anpc-hybrid', 'tnpc'] as const) {
      for (const e of expandElements(builtinLeg(t))) {
        for (const phi of [-75, -20, 0, 35, 80]) {
          const pa = planRemedial({ topology: t, faults: [`a.${e.id}`], loadAngleDeg: phi });
          for (const ph of ['b', 'c']) {
            const p = planRemedial({ topology: t, faults: [`${ph}.${e.id}`], loadAngleDeg: phi });
            expect(p.mMax).toBeCloseTo(pa.mMax, 9);
            expect(p.mMaxHull).toBeCloseTo(pa.mMaxHull, 9);
          }
        }
      }
    }
  });

  it('pairs: every pair listed, each class computed once, and a rotated pair equals its direct computation', () => {
    const a = faultAtlas({ topology: 'npc', modes: ['open'], pairs: true, stepDeg: 30 });
    const n = 3 * expandElements(builtinLeg('npc')).length; // open faults over three phases
    expect(a.entries).toHaveLength((n * (n - 1)) / 2);
    expect(new Set(a.entries.map((e) => e.faults.join('|'))).size).toBe(a.entries.length);
    expect(a.classesComputed).toBeLessThan(a.entries.length / 2.5);
    const sample = a.entries.filter((_, i) => i % 17 === 0);
    for (const e of sample) {
      const v = evaluateClaim({ name: 'x', topology: 'npc', faults: e.faults, m: 0, loadAngleDeg: [-90, 90] });
      expect(e.mMaxMin).toBeCloseTo(v.mMaxAtWorst, 9);
    }
  });

  it('canonicalRotation picks one representative per rotation class', () => {
    expect(canonicalRotation(['c.x:open'])).toEqual(['a.x:open']);
    expect(canonicalRotation(['b.x:open', 'c.y:short'])).toEqual(canonicalRotation(['a.x:open', 'b.y:short']));
    expect(canonicalRotation(['c.x:open', 'a.y:short'])).toEqual(canonicalRotation(['a.x:open', 'b.y:short']));
    const w = atlasWork({ topology: 'two-level', pairs: true });
    // 2 switches and 2 diodes per phase, 2 modes: 24 faults; pairs of distinct devices
    expect(w.faultSets).toHaveLength((24 * 23) / 2 - 3 * 4);
    w.faultSets.forEach((f, i) => expect(canonicalRotation(f)).toEqual(w.classes[w.classOf[i]!]));
  });

  it('mirror: the leg turned upside down (potentials negated, every device reversed) gives the same atlas entry for entry', () => {
    // Negating every potential and reversing every device maps each state to its mirror image:
    // levels and currents change sign, vectors turn by 180°, and the limit at each load angle is
    // the same. The device ids stay, so the entries match by name.
    for (const t of ['npc', 'anpc', 'tnpc'] as const) {
      const leg = builtinLeg(t);
      const mirrored: LegNetlist = {
        ...leg,
        name: `${leg.name} mirrored`,
        dcNodes: Object.fromEntries(Object.entries(leg.dcNodes).map(([k, v]) => [k, v === 0 ? 0 : -v])),
        devices: leg.devices.map((d) => ({ ...d, from: d.to, to: d.from })),
      };
      const a = faultAtlas({ topology: t, stepDeg: 10 });
      const b = faultAtlas({ topology: mirrored, stepDeg: 10 });
      const byName = new Map(b.entries.map((e) => [e.faults.join('|'), e]));
      for (const e of a.entries) {
        const m = byName.get(e.faults.join('|'));
        expect(m, e.faults.join('|')).toBeDefined();
        expect(m!.mMaxMin).toBeCloseTo(e.mMaxMin, 9);
        expect(m!.verdict).toBe(e.verdict);
        e.mMaxAt.forEach(([, v], k) => expect(m!.mMaxAt[k]![1]).toBeCloseTo(v, 9));
      }
    }
  });
});
