import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { diodeClampedLeg } from '../support/legs.js';
import { BUILTIN_TOPOLOGIES, builtinLeg, POLARITY_STRINGS, type LegTable, type PhaseOffer } from '@hexsalvage/core';
import {
  admissibleChecker,
  admissibleStands,
  diagramAtlas,
  expandElements,
  legLevels,
  phaseMoves,
  polarityDiagram,
  triangulate,
} from '@hexsalvage/core/internal';

// On a leg with many named patterns diagramAtlas first tries each diagram with the level moves
// between neighbouring levels only (a cheap search) and keeps it when every Delaunay triangle is
// admissible under those; otherwise it reads the full moves (small legs take the plain path). Here every diagram is rebuilt the plain way, from the full moves and
// without any cache, and must be the same: same vectors, triangles, reach, outline and tiling flag.
function plain(atlas: ReturnType<typeof diagramAtlas>, p: (typeof POLARITY_STRINGS)[number]) {
  const { analysis } = atlas;
  const dc = legLevels(analysis.leg);
  const offer = (t: LegTable): PhaseOffer => ({ levels: t.levels, moves: phaseMoves(t, analysis.rules, dc) });
  return polarityDiagram(
    { a: offer(analysis.phases.a), b: offer(analysis.phases.b), c: offer(analysis.phases.c) },
    p,
    atlas.healthyVectors,
    atlas.shells,
    analysis.rules,
  );
}

describe('diagrams built from neighbour moves first equal the plain ones', () => {
  it('on every built-in leg, healthy and with every single fault in both modes, under commutable and adjacent', () => {
    let staged = 0;
    for (const t of BUILTIN_TOPOLOGIES) {
      const faults = [[], ...expandElements(builtinLeg(t)).flatMap((e) => [[`a.${e.id}`], [`a.${e.id}:short`]])];
      for (const f of faults)
        for (const levelSteps of ['commutable', 'adjacent'] as const) {
          const atlas = diagramAtlas({ topology: t, faults: f, levelSteps });
          for (const p of POLARITY_STRINGS) {
            const got = atlas.faulted.get(p)!;
            const want = plain(atlas, p);
            expect(got.vectors.map((v) => [v.alpha, v.beta])).toEqual(want.vectors.map((v) => [v.alpha, v.beta]));
            expect(got.triangles).toEqual(want.triangles);
            expect(got.reach).toBe(want.reach);
            expect(got.outline === null).toBe(want.outline === null);
            expect(got.exactTiling).toBe(want.exactTiling);
            if (got.outline === null) staged++;
          }
        }
    }
    expect(staged).toBeGreaterThan(1000);
  });

  it('on a nine-level diode-clamped leg (the staged path), healthy and faulted', () => {
    let stood = 0;
    for (const n of [9]) {
      const leg = diodeClampedLeg(n);
      for (const f of [[], ['a.s1'], ['b.dA2:short']]) {
        const atlas = diagramAtlas({ topology: leg, faults: f });
        for (const p of POLARITY_STRINGS) {
          const got = atlas.faulted.get(p)!;
          const want = plain(atlas, p);
          expect(got.triangles, `${n} ${f.join()} ${p}`).toEqual(want.triangles);
          expect(got.reach).toBe(want.reach);
          expect(got.outline === null).toBe(want.outline === null);
          expect(got.exactTiling).toBe(want.exactTiling);
          if (got.outline === null) stood++;
        }
      }
    }
    expect(stood).toBeGreaterThan(50);
  });

  it('on the five-level example leg, healthy and faulted', () => {
    const five = JSON.parse(readFileSync(new URL('../../examples/five-level-leg.json', import.meta.url), 'utf8'));
    for (const f of [[], ['a.s1'], ['b.s4:short'], ['a.s2', 'c.s7']]) {
      const atlas = diagramAtlas({ topology: five, faults: f });
      for (const p of POLARITY_STRINGS) {
        const got = atlas.faulted.get(p)!;
        const want = plain(atlas, p);
        expect(got.triangles).toEqual(want.triangles);
        expect(got.reach).toBe(want.reach);
      }
    }
  });
});

describe('admissibleStands', () => {
  it('answers as admissibleChecker does on every Delaunay triangle of every built-in diagram, the five-level example and a nine-level leg', () => {
    const legs: unknown[] = [
      ...BUILTIN_TOPOLOGIES,
      JSON.parse(readFileSync(new URL('../../examples/five-level-leg.json', import.meta.url), 'utf8')),
      diodeClampedLeg(9),
    ];
    let yes = 0;
    let no = 0;
    for (const topology of legs) {
      const ids = expandElements(typeof topology === 'string' ? builtinLeg(topology as never) : (topology as never)).map((e) => e.id);
      for (const f of [[], [`a.${ids[0]}`], [`b.${ids[1]}:short`]]) {
        const atlas = diagramAtlas({ topology, faults: f });
        const dc = legLevels(atlas.analysis.leg);
        const moves = (['a', 'b', 'c'] as const).map((ph) => phaseMoves(atlas.analysis.phases[ph], atlas.analysis.rules, dc));
        for (const p of POLARITY_STRINGS) {
          const d = atlas.faulted.get(p)!;
          const chars = [...p] as ('+' | '-' | '?')[];
          const pm = [moves[0]![chars[0]!], moves[1]![chars[1]!], moves[2]![chars[2]!]] as const;
          const chain = admissibleChecker(pm);
          const stands = admissibleStands(d.vectors, pm);
          for (const t of triangulate(d.vectors.map((v) => [v.alpha, v.beta]))) {
            const want = chain(d.vectors, t) !== null;
            expect(stands(t)).toBe(want);
            if (want) yes++;
            else no++;
          }
        }
      }
    }
    expect(yes).toBeGreaterThan(1000);
    expect(no).toBeGreaterThan(10);
  });
});
