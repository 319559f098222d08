import { describe, expect, it } from 'vitest';
import { type PhaseState } from '@hexsalvage/core';
import { chooseSequence } from '@hexsalvage/core/internal';

// A three-level phase with one pattern per level (invented names): P, O, N.
const NAMES: Record<number, string> = { 1: 'P', 0: 'O', [-1]: 'N' };
const candidates = (_phase: number, level: number): PhaseState[] =>
  level in NAMES ? [{ level, pattern: NAMES[level] as string, gates: [NAMES[level] as string] }] : [];
// each step may change one phase by one pattern pair (the sequence rule)
const step = (_k: number, a: PhaseState, b: PhaseState) => Math.abs(a.level - b.level) <= 1;

describe('chooseSequence', () => {
  it('orders a small triangle so that each step changes one phase by one level', () => {
    const s = chooseSequence([[[0, 0, 0]], [[1, 0, 0]], [[1, 1, 0]]], candidates, [-1, 0, 1], new Set(), new Map(), step);
    expect(s).not.toBeNull();
    const states = s!.states.map((st) => st.map((p) => p.level));
    for (let i = 0; i < 2; i++) expect(states[i]!.filter((l, k) => l !== states[i + 1]![k]).length).toBe(1);
    expect(s!.levelJumps).toEqual([]);
  });

  it('gives null for a level the leg does not have (even where candidates offer one), and for a vertex without realisations', () => {
    const withHalf = (k: number, level: number): PhaseState[] => (level === 0.5 ? [{ level, pattern: 'H', gates: ['H'] }] : candidates(k, level));
    expect(chooseSequence([[[0, 0, 0]], [[0.5, 0, 0]], [[1, 1, 0]]], withHalf, [-1, 0, 1], new Set(), new Map(), step)).toBeNull();
    expect(chooseSequence([[[0, 0, 0]], [], [[1, 1, 0]]], candidates, [-1, 0, 1], new Set())).toBeNull();
  });
});
