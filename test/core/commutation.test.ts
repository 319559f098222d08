import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { BUILTIN_TOPOLOGIES, builtinLeg, parseNetlist, type LegNetlist, type LevelMove, type PhasePolarity } from '@hexsalvage/core';
import { commutates, expandElements, gateSetSolver, legLevels, patternLevel, phaseCommutations } from '@hexsalvage/core/internal';

// phaseCommutations takes two shortcuts: it stops at the first commutating pattern pair of each
// level change, and it reuses the '?' moves for a sign whose levels they already join completely.
// Here the moves are recomputed the plain way (every pattern pair, every polarity on its own) and
// must agree, and the on-demand pattern-pair answers must be what `commutates` says; the neighbour
// moves (searched on their own, with the same reuse of '?') must be the plain moves restricted.
function plainMoves(leg: LegNetlist, faults: ReadonlyMap<string, 'open' | 'short'>, pol: PhasePolarity): LevelMove[] {
  const solve = gateSetSolver(leg, faults, { ratings: true });
  const patterns = Object.values(leg.patterns);
  const level = patterns.map((g) => patternLevel(solve, g, pol));
  const forward = new Set<string>();
  patterns.forEach((a, i) =>
    patterns.forEach((b, j) => {
      const li = level[i];
      const lj = level[j];
      if (i !== j && li !== null && lj !== null && li !== lj && commutates(solve, a, b, pol)) forward.add(`${li}>${lj}`);
    }),
  );
  return [...forward]
    .map((f) => f.split('>').map(Number) as [number, number])
    .filter(([a, b]) => forward.has(`${b}>${a}`))
    .sort((x, y) => x[0] - y[0] || x[1] - y[1]);
}

function check(leg: LegNetlist, faults: ReadonlyMap<string, 'open' | 'short'>): void {
  const solve = gateSetSolver(leg, faults, { ratings: true });
  const patterns = Object.values(leg.patterns);
  const c = phaseCommutations(solve, patterns);
  for (const pol of ['+', '-', '?'] as const) {
    expect(c.moves[pol], `${leg.name} ${[...faults].join()} ${pol}`).toEqual(plainMoves(leg, faults, pol));
    patterns.forEach((a, i) =>
      patterns.forEach((b, j) => {
        if (i !== j) expect(c.patternsCommute(pol, i, j)).toBe(commutates(solve, a, b, pol));
      }),
    );
  }
  // the neighbour moves, asked of a fresh search (signs first, so that the reuse of '?' is taken
  // before the '?' moves are asked for), are the plain moves between neighbouring levels
  const dc = legLevels(leg);
  const fresh = phaseCommutations(solve, patterns);
  for (const pol of ['+', '-', '?'] as const) {
    const near = plainMoves(leg, faults, pol).filter(([a, b]) => Math.abs(dc.indexOf(a) - dc.indexOf(b)) === 1);
    expect(fresh.adjacentMoves(pol, dc), `${leg.name} ${[...faults].join()} ${pol} neighbours`).toEqual(near);
  }
}

describe('phaseCommutations against the plain search', () => {
  it('agrees on every built-in leg, healthy and with every single fault in both modes', () => {
    for (const t of BUILTIN_TOPOLOGIES) {
      const leg = builtinLeg(t);
      check(leg, new Map());
      for (const e of expandElements(leg)) for (const mode of ['open', 'short'] as const) check(leg, new Map([[e.id, mode]]));
    }
  });
  it('agrees on the five-level example leg, healthy and with faults', () => {
    const leg = parseNetlist(JSON.parse(readFileSync(new URL('../../examples/five-level-leg.json', import.meta.url), 'utf8')), 'five-level-leg.json');
    check(leg, new Map());
    for (const e of expandElements(leg).slice(0, 6)) check(leg, new Map([[e.id, 'open']]));
  });
});
