import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { createModulator, HexsalvageInputError, planRemedial, polarityAt, POLARITY_STRINGS, switchingTable } from '@hexsalvage/core';
import { clarke, locateReference } from '@hexsalvage/core/internal';
import { fc, fcParams } from '../support/fc.js';

const plan = planRemedial({ topology: 'npc', faults: ['a.outerUpper'] });
const table = switchingTable({ topology: 'anpc-hybrid', faults: ['a.innerUpper'] });
const point = fc.record({
  a: fc.double({ min: -1.6, max: 1.6, noNaN: true }),
  b: fc.double({ min: -1.6, max: 1.6, noNaN: true }),
  p: fc.constantFrom(...POLARITY_STRINGS),
});

describe('createModulator', () => {
  it('agrees exactly with the plain search on a rotating reference (the previous-triangle path), every polarity window', () => {
    const five = planRemedial({ topology: JSON.parse(readFileSync(new URL('../../examples/five-level-leg.json', import.meta.url), 'utf8')), faults: ['a.s2'] });
    for (const [source, phi] of [
      [plan, 30],
      [table, -20],
      [five, 10],
    ] as const) {
      const mod = createModulator(source);
      const out = new Float64Array(4);
      fc.assert(
        fc.property(
          fc.double({ min: 0.05, max: 1.3, noNaN: true }),
          fc.double({ min: 0, max: 360, noNaN: true }),
          fc.integer({ min: 200, max: 3000 }),
          (m, start, steps) => {
            for (let k = 0; k < 400; k++) {
              const th = ((start + (k * 360) / steps) * Math.PI) / 180;
              const p = polarityAt((th * 180) / Math.PI, phi, 0);
              const a = m * Math.cos(th);
              const b = m * Math.sin(th);
              const plain = locateReference(source.polarities[p]!, a, b);
              const t = mod.modulateInto(a, b, mod.polarityIndex(p), out);
              if (!plain.ok) {
                expect(t).toBe(-1);
                continue;
              }
              expect(t).toBe(plain.triangle);
              expect([out[0], out[1], out[2]]).toEqual([...plain.dwell]);
              expect(out[3] === 1).toBe(plain.clamped);
            }
          },
        ),
        fcParams(60),
      );
    }
  });

  for (const [name, source] of [
    ['a plan', plan],
    ['a switching table', table],
  ] as const) {
    it(`agrees exactly with the plain triangle search (${name}), both paths`, () => {
      const mod = createModulator(source);
      const out = new Float64Array(4);
      fc.assert(
        fc.property(point, ({ a, b, p }) => {
          const plain = locateReference(source.polarities[p]!, a, b);
          const r = mod.modulate(a, b, p);
          const t = mod.modulateInto(a, b, mod.polarityIndex(p), out);
          if (!plain.ok) {
            expect(r.triangle).toBe(-1);
            expect(t).toBe(-1);
            return;
          }
          expect(r.triangle).toBe(plain.triangle);
          expect(t).toBe(plain.triangle);
          expect(r.dwell).toEqual(plain.dwell);
          expect([out[0], out[1], out[2]]).toEqual([...plain.dwell]);
          expect(r.clamped).toBe(plain.clamped);
          expect(out[3] === 1).toBe(plain.clamped);
        }),
        fcParams(2000),
      );
    });
  }

  it('agrees exactly on the degenerate spots: vertices, edge midpoints and the origin', () => {
    for (const source of [plan, table]) {
      const mod = createModulator(source);
      const out = new Float64Array(4);
      for (const p of POLARITY_STRINGS) {
        const d = source.polarities[p]!;
        const spots: [number, number][] = [[0, 0], ...d.vectors.map((v) => [v.alpha, v.beta] as [number, number])];
        for (const t of d.triangles)
          for (let k = 0; k < 3; k++) {
            const a = d.vectors[t[k]!]!;
            const b = d.vectors[t[(k + 1) % 3]!]!;
            spots.push([(a.alpha + b.alpha) / 2, (a.beta + b.beta) / 2]);
          }
        for (const [x, y] of spots) {
          const plain = locateReference(d, x, y);
          const tri = mod.modulateInto(x, y, mod.polarityIndex(p), out);
          expect(tri).toBe(plain.ok ? plain.triangle : -1);
          if (plain.ok) expect([out[0], out[1], out[2], out[3] === 1]).toEqual([...plain.dwell, plain.clamped]);
        }
      }
    }
  });

  it('rebuilds references inside the hull with dwell times in [0, 1] summing to 1', () => {
    const mod = createModulator(table);
    fc.assert(
      fc.property(point, ({ a, b, p }) => {
        const r = mod.modulate(a, b, p);
        if (r.triangle < 0 || r.clamped) return;
        for (const d of r.dwell) expect(d >= 0 && d <= 1).toBe(true);
        expect(r.dwell[0] + r.dwell[1] + r.dwell[2]).toBeCloseTo(1, 12);
        const [x, y] = r.vertices.reduce<[number, number]>(
          (s, t, k) => {
            const [va, vb] = clarke(t);
            return [s[0] + r.dwell[k]! * va, s[1] + r.dwell[k]! * vb];
          },
          [0, 0],
        );
        // to the locator's tolerance: a point within 1e-9 (barycentric) of the hull counts as inside
        expect(x).toBeCloseTo(a, 8);
        expect(y).toBeCloseTo(b, 8);
      }),
      fcParams(1000),
    );
  });

  it('flags references outside the hull as clamped and brings them to the boundary', () => {
    const mod = createModulator(plan);
    const r = mod.modulate(1.2, 0, '+--'); // beyond the faulted hull's 2/3 at 0°
    expect(r.clamped).toBe(true);
    const [x, y] = r.vertices.reduce<[number, number]>(
      (s, t, k) => {
        const [va, vb] = clarke(t);
        return [s[0] + r.dwell[k]! * va, s[1] + r.dwell[k]! * vb];
      },
      [0, 0],
    );
    expect(x).toBeCloseTo(2 / 3, 9);
    expect(y).toBeCloseTo(0, 9);
  });

  it('applies the triplet the switching sequence chose when built from a table', () => {
    const mod = createModulator(table);
    const r = mod.modulate(0.05, 0.02, '+--');
    const tri = table.polarities['+--']!.tableTriangles[r.triangle]!;
    r.vertices.forEach((t, k) => expect(t).toEqual(tri.vertices[k]!.realisations[tri.sequence!.choice[k]!]!.levels));
  });

  it('rejects a malformed polarity and non-finite references', () => {
    const mod = createModulator(plan);
    expect(() => mod.modulate(0, 0, '+++')).toThrow(HexsalvageInputError);
    expect(() => mod.modulate(Number.NaN, 0, '+--')).toThrow('finite');
  });

  it('keeps no stale answer between calls: a bad reference or polarity right after a good one is still refused', () => {
    const mod = createModulator(plan);
    const good = mod.modulate(0.05, 0.02, '+--');
    expect(good.triangle).toBeGreaterThanOrEqual(0);
    // the same triangle was the last one: a NaN must not be answered from it
    expect(() => mod.modulate(Number.NaN, 0.02, '+--')).toThrow('finite');
    expect(() => mod.modulate(0.05, Number.POSITIVE_INFINITY, '+--')).toThrow('finite');
    expect(mod.modulateInto(Number.NaN, 0.02, mod.polarityIndex('+--'), new Float64Array(4))).toBe(-2);
    // the last polarity string is remembered; another string, valid or not, is looked up afresh
    expect(() => mod.modulate(0.05, 0.02, '+++')).toThrow(HexsalvageInputError);
    expect(mod.polarityIndex('-++')).toBe(POLARITY_STRINGS.indexOf('-++'));
    expect(mod.polarityIndex('+--')).toBe(POLARITY_STRINGS.indexOf('+--'));
    expect(mod.modulate(0.05, 0.02, '+--')).toEqual(good);
  });
});
