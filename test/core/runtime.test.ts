import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import {
  analyseLeg,
  BUILTIN_TOPOLOGIES,
  builtinLeg,
  createRuntime,
  deratingCurve,
  deratingSteps,
  exportC,
  HexsalvageInputError,
  parsePolarity,
  POLARITY_STRINGS,
  runtimeStream,
  type LegNetlist,
  type LevelStepRule,
  type PhasePolarity,
  type RuntimeOptions,
  type StreamEntry,
  type StreamSegment,
  type SwitchingTable,
} from '@hexsalvage/core';
import {
  commutates,
  diagramAtlas,
  expandElements,
  legLevels,
  patternLevel,
  planFromAtlas,
  runtimeProgram,
  switchingTableFromAtlas,
} from '@hexsalvage/core/internal';
import { fc, FC_SEED } from '../support/fc.js';

const FIVE = JSON.parse(readFileSync(new URL('../../examples/five-level-leg.json', import.meta.url), 'utf8')) as LegNetlist;
const LEGS: [string, string | LegNetlist][] = [...BUILTIN_TOPOLOGIES.map((t) => [t, t] as [string, string]), ['five-level', FIVE]];
const dirs: string[] = [];
afterAll(() => {
  for (const d of dirs) rmSync(d, { recursive: true, force: true });
});

// Every leg healthy and with every single fault of phase a (open and short), under both sequence rules.
const CASES = LEGS.flatMap(([name, topology]) => {
  const leg = typeof topology === 'string' ? builtinLeg(topology as never) : topology;
  const faults = [[], ...expandElements(leg).flatMap((e) => [[`a.${e.id}:open`], [`a.${e.id}:short`]])];
  return faults.flatMap((f) => (['commutable', 'adjacent'] as LevelStepRule[]).map((levelSteps) => ({ name, topology, faults: f, levelSteps })));
});

/**
 * The checks of a stream that do not use the runtime's own tables: the level of every segment is
 * what the leg solver gives for its pattern under the segment's polarity; each step changes the
 * pattern of at most one phase (else it is a multi-phase step); a phase whose character stays
 * makes a level change listed in the leg's moves for that character (commutation search,
 * contract Version 2); a phase whose character changes makes a change that commutates for the new
 * character (for `?`, both signs) into a usable pattern, and under `adjacent` to a neighbouring
 * level at most.
 */
function walk(stream: readonly StreamSegment[], topology: unknown, faults: readonly string[], levelSteps: LevelStepRule, entry: StreamEntry | null) {
  const a = analyseLeg({ topology, faults, levelSteps });
  const dc = legLevels(a.leg);
  const moves = (['a', 'b', 'c'] as const).map((ph) => {
    const m = a.phases[ph].commutations.moves;
    const near = (x: readonly [number, number]) => levelSteps !== 'adjacent' || Math.abs(dc.indexOf(x[0]) - dc.indexOf(x[1])) === 1;
    return (c: PhasePolarity) => new Set(m[c].filter(near).map((x) => `${x[0]}>${x[1]}`));
  });
  let multi = 0;
  let bad: string[] = [];
  // every step: from the state the period starts in (when given) into the first segment, then on
  const states: readonly StreamEntry[] = entry ? [entry, ...stream] : stream;
  for (let i = 0; i + 1 < states.length; i++) {
    const s = states[i] as StreamEntry;
    const t = states[i + 1] as StreamEntry;
    const cs = parsePolarity(s.polarity);
    const ct = parsePolarity(t.polarity);
    const changed = [0, 1, 2].filter((k) => s.patterns[k] !== t.patterns[k]);
    if (changed.length > 1) multi++;
    for (const k of changed) {
      const table = a.phases['abc'[k] as 'a'];
      const gi = a.leg.patterns[s.patterns[k] as string] as readonly string[];
      const gj = a.leg.patterns[t.patterns[k] as string] as readonly string[];
      if (cs[k] === ct[k]) {
        const c = cs[k] as PhasePolarity;
        const l0 = patternLevel(table.solve, gi, c);
        const l1 = patternLevel(table.solve, gj, c);
        const ok = l0 !== null && l1 !== null && (l0 === l1 || moves[k]!(c).has(`${l0}>${l1}`)) && commutates(table.solve, gi, gj, c);
        if (!ok) bad.push(`${i}: phase ${'abc'[k]} ${s.patterns[k]}>${t.patterns[k]} under ${c}`);
      } else {
        const c = ct[k] as PhasePolarity;
        const l1 = patternLevel(table.solve, gj, c);
        const from = ['+', '-'].map((sg) => patternLevel(table.solve, gi, sg as PhasePolarity)).filter((l): l is number => l !== null);
        const ok =
          l1 !== null && commutates(table.solve, gi, gj, c) && (levelSteps !== 'adjacent' || from.every((l) => Math.abs(dc.indexOf(l) - dc.indexOf(l1)) <= 1));
        if (!ok) bad.push(`${i}: phase ${'abc'[k]} ${s.patterns[k]}>${t.patterns[k]} entering ${c}`);
      }
    }
  }
  // every segment's levels are what its patterns give (chain states may still show the old character)
  for (const s of stream) {
    const cs = parsePolarity(s.polarity);
    s.patterns.forEach((p, k) => {
      const l = patternLevel(a.phases['abc'[k] as 'a'].solve, a.leg.patterns[p] as readonly string[], cs[k] as PhasePolarity);
      if (l !== null && l !== s.levels[k]) bad.push(`level of ${p} is ${l}, stream says ${s.levels[k]}`);
    });
  }
  bad = [...new Set(bad)];
  return { multi, bad };
}

// Fundamental of the line voltage a–b over the period (units of Vdc/2), from the stream's own levels.
function lineFundamental(stream: readonly StreamSegment[]): number {
  let a = 0;
  let b = 0;
  for (const s of stream) {
    const v = (s.levels[0] as number) - (s.levels[1] as number);
    const w = 2 * Math.PI;
    a += (v * (Math.sin(w * (s.t + s.dt)) - Math.sin(w * s.t))) / w;
    b -= (v * (Math.cos(w * (s.t + s.dt)) - Math.cos(w * s.t))) / w;
  }
  return 2 * Math.hypot(a, b);
}

describe('the runtime stream (contract, Version 3)', () => {
  // one seeded operating point per leg, fault and rule: m up to just below mMax, any load angle,
  // margin 0 or a few degrees, odd and even period counts
  const points = fc.sample(
    fc.tuple(fc.integer({ min: 20, max: 99 }), fc.integer({ min: -90, max: 90 }), fc.constantFrom(0, 4), fc.integer({ min: 9, max: 48 })),
    { seed: FC_SEED, numRuns: CASES.length },
  );
  it('moves one phase per step by allowed moves, chains periods, and keeps the fundamental (every leg, every single fault, both rules)', () => {
    let checked = 0;
    const held: string[] = [];
    CASES.forEach(({ name, topology, faults, levelSteps }, i) => {
      const [pct, phi, delta, half] = points[i] as [number, number, number, number];
      const atlas = diagramAtlas({ topology, faults, levelSteps });
      const plan = planFromAtlas(atlas, phi, delta);
      if (plan.mMax === 0) return;
      const m = (pct / 100) * plan.mMax;
      const N = 2 * half + (i % 2); // odd and even period counts
      const s = runtimeStream(switchingTableFromAtlas(atlas), { m, loadAngleDeg: phi, polarityMarginDeg: delta, frequencyRatio: N });
      const label = `${name} ${faults.join()} ${levelSteps} m=${m.toFixed(3)} phi=${phi} delta=${delta} N=${N}`;
      const w = walk(s.segments, topology, faults, levelSteps, s.entry);
      expect(w.bad, label).toEqual([]);
      expect(s.multiPhaseSteps, label).toBe(w.multi);
      // a periodic stream starts from its own last state
      if (s.periodic) expect(s.entry.patterns, label).toEqual(s.segments[s.segments.length - 1]!.patterns);
      if (faults.length === 0) expect([s.multiPhaseSteps, s.heldUpdates], label).toEqual([0, 0]);
      if (s.heldUpdates > 0) held.push(label);
      expect(s.segments.reduce((t, x) => t + x.dt, 0)).toBeCloseTo(1, 12);
      // the fundamental of a–b is √3·m; sampling the reference once per period costs a little
      // (about 1 − sinc(π/N) of it, from memory: the zero-order hold of regular sampling)
      if (s.clampedUpdates === 0 && s.chainSteps === 0 && s.heldUpdates === 0)
        expect(Math.abs(lineFundamental(s.segments) / (Math.sqrt(3) * m) - 1), label).toBeLessThan(3 / (N * N) + 2e-3);
      checked++;
    });
    expect(checked).toBeGreaterThan(200);
    // where the runtime holds, the fault leaves no safe way between neighbouring triangles; it stays rare
    expect(held.length, held.join('\n')).toBeLessThan(checked / 10);
  });

  it('never lets a healthy leg change two phases at once, in either sequence mode and either update (every built-in leg)', () => {
    for (const [name, topology] of LEGS)
      for (const sequence of ['continuous', 'discontinuous'] as const)
        for (const update of ['period', 'half'] as const) {
          const atlas = diagramAtlas({ topology, levelSteps: 'adjacent' });
          const s = runtimeStream(switchingTableFromAtlas(atlas), {
            m: 0.9 * planFromAtlas(atlas, 20, 0).mMax,
            loadAngleDeg: 20,
            frequencyRatio: 61,
            sequence,
            update,
          });
          const w = walk(s.segments, topology, [], 'adjacent', s.segments[s.segments.length - 1]!);
          expect(w.bad, `${name} ${sequence} ${update}`).toEqual([]);
          expect(w.multi, `${name} ${sequence} ${update}`).toBe(0);
          expect(s.multiPhaseSteps).toBe(0);
          expect(s.periodic).toBe(true);
        }
  });

  it('counts the step that happens at a period boundary when the closed loop repeats only every two fundamental periods', () => {
    // healthy five-level leg, adjacent levels, an odd period count: the balance leaves the leg in
    // the other realisation of the redundant vertices after one fundamental period (found by a
    // random seed of the sweep above); the step into the first segment comes from that state
    const atlas = diagramAtlas({ topology: FIVE, levelSteps: 'adjacent' });
    const s = runtimeStream(switchingTableFromAtlas(atlas), { m: 0.797, loadAngleDeg: -26, polarityMarginDeg: 4, frequencyRatio: 63 });
    const last = s.segments[s.segments.length - 1]!;
    expect(s.periodic).toBe(false);
    expect(s.entry.patterns).not.toEqual(last.patterns);
    const w = walk(s.segments, FIVE, [], 'adjacent', s.entry);
    expect(w.bad).toEqual([]);
    expect([w.multi, s.multiPhaseSteps]).toEqual([0, 0]);
    // the step from the stream's own end into its start would change two phases: it never happens
    expect(walk([last, s.segments[0]!], FIVE, [], 'adjacent', null).multi).toBe(1);
  });

  it('a step count check that can fail: a stream with a two-phase step is counted', () => {
    const atlas = diagramAtlas({ topology: 'npc' });
    const s = runtimeStream(switchingTableFromAtlas(atlas), { m: 0.8, frequencyRatio: 24 });
    // leave out one segment whose neighbours differ in two phases
    const n = s.segments.length;
    const differ = (a: StreamSegment, b: StreamSegment) => [0, 1, 2].filter((k) => a.patterns[k] !== b.patterns[k]).length;
    const cut = s.segments.findIndex((_, i) => i > 0 && i < n - 1 && differ(s.segments[i - 1]!, s.segments[i + 1]!) === 2);
    expect(cut).toBeGreaterThan(0);
    const broken = s.segments.filter((_, i) => i !== cut);
    expect(walk(broken, 'npc', [], 'commutable', null).multi).toBeGreaterThan(0);
  });
});

describe('midpoint balance built into the runtime', () => {
  // ≤ 0.2 % of the current peak up to mMaxBalanced, from the stream's own levels and sinusoidal
  // currents (the runtime in closed loop with its own midpoint charge, steady state)
  const cases: [string, string[], number, number, string | LegNetlist][] = [
    ['npc', [], 0, 0, 'npc'],
    ['npc', [], 30, 0, 'npc'],
    ['npc', [], 75, 5, 'npc'],
    ['anpc', [], 40, 0, 'anpc'],
    ['tnpc', [], 60, 3, 'tnpc'],
    ['npc', ['a.outerUpper'], 25, 0, 'npc'],
    ['anpc-hybrid', ['a.innerUpper'], 25, 3, 'anpc-hybrid'],
    ['tnpc', ['a.upper'], 10, 0, 'tnpc'],
    ['five-level', ['a.dB2:short'], 0, 5, FIVE],
    ['five-level', [], 45, 0, FIVE],
  ];
  it.each(cases)('%s %j at %d° (margin %d°): about zero at 50 %, 90 % and 99.5 % of mMaxBalanced', (_n, faults, phi, delta, topology) => {
    const atlas = diagramAtlas({ topology, faults });
    const plan = planFromAtlas(atlas, phi, delta);
    const table = switchingTableFromAtlas(atlas);
    for (const f of [0.5, 0.9, 0.995]) {
      const m = f * plan.mMaxBalanced;
      if (m === 0) continue;
      const s = runtimeStream(table, { m, loadAngleDeg: phi, polarityMarginDeg: delta, frequencyRatio: 72 });
      expect(Math.abs(s.midpointAverage), `m=${m}`).toBeLessThanOrEqual(0.002);
    }
  });
  it('drifts with balancing off on a faulted hybrid ANPC (the check can fail)', () => {
    const atlas = diagramAtlas({ topology: 'anpc-hybrid', faults: ['a.innerUpper'] });
    const s = runtimeStream(switchingTableFromAtlas(atlas), { m: 0.45, loadAngleDeg: 25, frequencyRatio: 72, balance: 'off' });
    expect(Math.abs(s.midpointAverage)).toBeGreaterThan(0.01);
  });
  it('gives conventional centred SVM on a healthy two-level leg: the zero vectors split equally', () => {
    const atlas = diagramAtlas({ topology: 'two-level' });
    const rt = createRuntime(switchingTableFromAtlas(atlas));
    const out = rt.output();
    rt.period(0.5, 0.2, POLARITY_STRINGS.indexOf('+--'), 1, -0.5, -0.5, 0, out);
    expect(out.split).toBe(0.5);
    expect(out.count).toBe(7);
  });
});

describe('runtime input checks', () => {
  const table = switchingTableFromAtlas(diagramAtlas({ topology: 'npc' }));
  it.each([
    [{ sequence: 'zigzag' }, 'sequence'],
    [{ balance: 'yes' }, 'balance'],
    [{ chainDwell: 0 }, 'chainDwell'],
    [{ midpointGain: -1 }, 'midpointGain'],
  ] as const)('refuses %j', (opt, key) => {
    expect(() => createRuntime(table, opt as unknown as RuntimeOptions)).toThrow(HexsalvageInputError);
    expect(() => createRuntime(table, opt as unknown as RuntimeOptions)).toThrow(key);
  });
  it('refuses a polarity index out of range and a foreign buffer', () => {
    const rt = createRuntime(table);
    expect(() => rt.period(0.1, 0, 25, 1, 0, -1, 0, rt.output())).toThrow('polarityIndex');
    expect(() => rt.period(0.1, 0, 0, 1, 0, -1, 0, { count: 0 } as never)).toThrow('out');
  });
});

// A C program that runs the header's runtime on commands from stdin and prints what it applies.
const DRIVER = `#include <stdio.h>
#include "rt_table.h"
int main(void)
{
  rt_runtime r; rt_output o; char mode; int q, nq, k, t; double a, b, ia, ib, ic, e, gain, chain; int cont, bal;
  if (scanf(" %d %d %lf %lf", &cont, &bal, &gain, &chain) != 4) return 2;
  rt_runtime_init(&r, cont, bal, gain, chain);
  while (scanf(" %c %d %d %lf %lf %lf %lf %lf %lf", &mode, &q, &nq, &a, &b, &ia, &ib, &ic, &e) == 9) {
    t = mode == 'h' ? rt_runtime_half(&r, q, nq, a, b, ia, ib, ic, e, &o) : rt_runtime_period(&r, q, nq, a, b, ia, ib, ic, e, &o);
    printf("%d %d %d %d %.17g", t, o.count, o.chain_steps, o.held, o.split);
    for (k = 0; k < o.count; k++) printf(" %d/%d/%d:%.17g", o.pattern[k][0], o.pattern[k][1], o.pattern[k][2], o.duration[k]);
    printf("\\n");
  }
  printf("mmax");
  for (k = -1800; k <= 1800; k += 5) printf(" %.17g", rt_m_max_at(k / 10.0));
  printf("\\n");
  return 0;
}
`;

describe('the triangles next to each triangle (what the C runtime tests before it searches)', () => {
  // invariants of an edge adjacency: symmetric, within one polarity, exactly one shared edge, and
  // every edge shared by two triangles listed (checked against a plain search over all pairs)
  it.each([
    ['npc', 'npc', []],
    ['npc a.outerUpper', 'npc', ['a.outerUpper']],
    ['anpc-hybrid a.innerUpper', 'anpc-hybrid', ['a.innerUpper']],
    ['five-level', FIVE, []],
  ] as [string, string | LegNetlist, string[]][])('%s', (_n, topology, faults) => {
    const table = switchingTableFromAtlas(diagramAtlas({ topology, faults }));
    const p = runtimeProgram(table);
    const global: [number, readonly number[]][] = [];
    POLARITY_STRINGS.forEach((pol, q) => (table.polarities[pol]?.triangles ?? []).forEach((tri) => global.push([q, tri])));
    expect(p.triNext.length).toBe(3 * global.length);
    const shared = (a: readonly number[], b: readonly number[]) => a.filter((v) => b.includes(v)).length;
    global.forEach(([q, tri], g) => {
      const listed = [0, 1, 2].map((e) => p.triNext[3 * g + e] as number).filter((u) => u >= 0);
      const expected = global.flatMap(([q2, tri2], u) => (u !== g && q2 === q && shared(tri, tri2) === 2 ? [u] : []));
      expect([...listed].sort((x, y) => x - y)).toEqual(expected);
      for (const u of listed) expect([0, 1, 2].map((e) => p.triNext[3 * u + e])).toContain(g);
    });
  });
});

describe('the C header runtime', () => {
  const cc = ['cc', 'gcc', 'clang'].find((c) => spawnSync(c, ['--version']).status === 0);
  const cases: [string, string | LegNetlist, string[], LevelStepRule, RuntimeOptions, 'p' | 'h', number, number][] = [
    ['npc healthy', 'npc', [], 'adjacent', {}, 'p', 0.9, 20],
    ['npc a.outerUpper', 'npc', ['a.outerUpper'], 'commutable', { midpointGain: 30 }, 'h', 0.5, 25],
    ['anpc-hybrid a.innerUpper', 'anpc-hybrid', ['a.innerUpper'], 'commutable', { sequence: 'discontinuous' }, 'p', 0.45, 25],
    ['five-level a.dB2:short', FIVE, ['a.dB2:short'], 'commutable', { balance: 'off' }, 'h', 0.5, 0],
    ['tnpc a.neutralToOut', 'tnpc', ['a.neutralToOut'], 'adjacent', { midpointGain: 10, chainDwell: 0.05 }, 'p', 0.4, 60],
  ];
  it.skipIf(!cc).each(cases)(
    'compiles with -std=c99 -Wall -Wextra -Werror and gives the same stream as TypeScript (%s)',
    (_n, topology, faults, levelSteps, options, mode, m, phi) => {
      const atlas = diagramAtlas({ topology, faults, levelSteps });
      const table: SwitchingTable = switchingTableFromAtlas(atlas);
      const derating = deratingSteps(atlas);
      const dir = mkdtempSync(join(tmpdir(), 'hexsalvage-rt-'));
      dirs.push(dir);
      writeFileSync(join(dir, 'rt_table.h'), exportC(table, { prefix: 'rt', derating, runtime: options }));
      writeFileSync(join(dir, 'driver.c'), DRIVER);
      execFileSync(cc as string, ['-std=c99', '-O2', '-Wall', '-Wextra', '-Werror', '-o', join(dir, 'driver'), join(dir, 'driver.c'), '-lm']);
      // a rotating reference with measured currents and a midpoint error, two fundamental periods
      const N = 40;
      const lines: string[] = [];
      const calls: [number, number, number, number, number, number, number, number][] = [];
      const rnd = fc.sample(fc.double({ min: -0.02, max: 0.02, noNaN: true }), { seed: FC_SEED, numRuns: 4 * N });
      for (let u = 0; u < 4 * N; u++) {
        const deg = ((u + 0.5) * 360) / (mode === 'h' ? 2 * N : N);
        const th = (deg * Math.PI) / 180;
        const q = POLARITY_STRINGS.indexOf(polarityOf(deg, phi));
        const nq = POLARITY_STRINGS.indexOf(polarityOf(deg + 360 / (mode === 'h' ? 2 * N : N), phi));
        const i = [0, 1, 2].map((k) => 100 * Math.cos(th - (phi * Math.PI) / 180 - (k * 2 * Math.PI) / 3));
        calls.push([q, nq, m * Math.cos(th), m * Math.sin(th), i[0]!, i[1]!, i[2]!, rnd[u]!]);
      }
      const rt = createRuntime(table, options);
      const o = rt.options;
      lines.push(`${o.sequence === 'continuous' ? 1 : 0} ${o.balance === 'on' ? 1 : 0} ${o.midpointGain.toPrecision(17)} ${o.chainDwell.toPrecision(17)}`);
      for (const c of calls)
        lines.push(
          `${mode} ${c[0]} ${c[1]} ${c
            .slice(2)
            .map((x) => x.toPrecision(17))
            .join(' ')}`,
        );
      const out = execFileSync(join(dir, 'driver'), { input: `${lines.join('\n')}\n` })
        .toString()
        .trim()
        .split('\n');
      const buf = rt.output();
      calls.forEach((c, k) => {
        const t = mode === 'h' ? rt.half(c[2], c[3], c[0], c[4], c[5], c[6], c[7], buf, c[1]) : rt.period(c[2], c[3], c[0], c[4], c[5], c[6], c[7], buf, c[1]);
        const parts = (out[k] as string).split(' ');
        expect(Number(parts[0])).toBe(t);
        expect(Number(parts[1])).toBe(buf.count);
        expect(Number(parts[2])).toBe(buf.chainSteps);
        expect(Number(parts[3])).toBe(buf.held ? 1 : 0);
        if (Number.isNaN(buf.split)) expect(parts[4]).toMatch(/nan/i);
        else expect(Math.abs(Number(parts[4]) - buf.split)).toBeLessThan(1e-12);
        for (let s = 0; s < buf.count; s++) {
          const [pat, dur] = (parts[5 + s] as string).split(':');
          expect(pat).toBe(`${buf.patterns[3 * s]}/${buf.patterns[3 * s + 1]}/${buf.patterns[3 * s + 2]}`);
          expect(Math.abs(Number(dur) - (buf.duration[s] as number))).toBeLessThan(1e-12);
        }
      });
      // the derating function: never above the exact limit at 0.25° steps, and close to it on average
      const last = (out[out.length - 1] as string).split(' ').slice(1).map(Number);
      expect(last).toHaveLength(721);
      const curve = deratingCurve(atlas, { fromDeg: -180, toDeg: 180, stepDeg: 0.25 });
      const inC = (deg: number) => derating.minima[Math.min(derating.minima.length - 1, Math.floor((deg + 180) / derating.stepDeg))] as number;
      let sumC = 0;
      let sumExact = 0;
      for (const p of curve) {
        expect(inC(p.loadAngleDeg)).toBeLessThanOrEqual(p.mMax + 1e-12);
        sumC += inC(p.loadAngleDeg);
        sumExact += p.mMax;
      }
      if (sumExact > 0) expect(sumC / sumExact).toBeGreaterThanOrEqual(0.99);
      last.forEach((v, j) => expect(v).toBe(inC(-180 + j * 0.5)));
    },
  );
});

function polarityOf(deg: number, phi: number): string {
  return [0, 120, 240]
    .map((s) => {
      const x = (((deg - phi - s) % 360) + 360) % 360;
      return x === 90 || x === 270 ? '?' : x < 90 || x > 270 ? '+' : '-';
    })
    .join('');
}
