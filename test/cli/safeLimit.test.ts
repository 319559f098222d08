import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runBin, runInProcess } from '../support/cli.js';

const dir = mkdtempSync(join(tmpdir(), 'hexsalvage-safe-'));

// The three cases the first version answered unsafely, through every command that gives a limit.
const CASES = [
  ['npc', 'a.outerUpper:short'],
  ['npc', 'a.clampUpper'],
  ['npc', 'a.innerUpper'],
] as const;

describe('the safe limit through the command line (contract, Version 2)', () => {
  it.each(CASES)('plan --json of %s %s gives mMax 0 with the rules, the hull bound and the reason', async (topology, fault) => {
    const r = await runInProcess(['plan', '--topology', topology, '--fault', fault, '--load-angle', '25', '--json']);
    expect(r.code).toBe(0);
    const p = JSON.parse(r.stdout);
    expect(p.mMax).toBe(0);
    expect(p.mMaxBalanced).toBe(0);
    expect(p.rules).toEqual({ ratings: true, levelSteps: 'commutable' });
    expect(p.unrated).toEqual([]);
    expect(Array.isArray(p.notes)).toBe(true);
    expect(p.restrictions.length).toBeGreaterThan(0);
    expect(typeof p.mMaxHull).toBe('number');
  });

  it.each(CASES)('plan text of %s %s says plainly that the drive cannot run', async (topology, fault) => {
    const r = await runInProcess(['plan', '--topology', topology, '--fault', fault]);
    expect(r.stdout).toContain('CANNOT RUN in this state');
    expect(r.stdout).not.toContain('hull edge none');
  });

  it('plan shows the hull bound beside mMax where they differ, with the reason in words', async () => {
    const r = await runInProcess(['plan', '--topology', 'npc', '--fault', 'a.clampUpper', '--load-angle', '25']);
    expect(r.stdout).toMatch(/Convex-hull bound \(first version, for review\): 1\.154701/);
    expect(r.stdout).toContain('no safe P↔N change while its current is positive');
    expect(r.stdout).toContain('outerUpper would block 2 × Vdc/2');
  });

  it('--ignore-ratings --level-steps any gives back the first version (unsafe) answer', async () => {
    const r = await runInProcess(['plan', '--topology', 'npc', '--fault', 'a.outerUpper:short', '--ignore-ratings', '--level-steps', 'any', '--json']);
    const p = JSON.parse(r.stdout);
    expect(p.mMax).toBeCloseTo(2 / Math.sqrt(3), 12);
    expect(p.rules).toEqual({ ratings: false, levelSteps: 'any' });
  });

  it('leg --json carries unsafe reasons and the moves of each phase', async () => {
    const r = await runInProcess(['leg', '--topology', 'npc', '--fault', 'a.clampUpper', '--json']);
    const d = JSON.parse(r.stdout);
    expect(d.phases.a.patterns.O).toEqual({ '+': null, '-': 0, unsafe: { '+': 'outerUpper blocks 2 > rating 1' } });
    expect(d.phases.a.moves['+']).toEqual([]);
    expect(d.phases.a.moves['-']).toEqual([
      [-1, 0],
      [-1, 1],
      [0, -1],
      [0, 1],
      [1, -1],
      [1, 0],
    ]);
    expect(d.phases.b.moves['?']).toEqual([
      [-1, 0],
      [-1, 1],
      [0, -1],
      [0, 1],
      [1, -1],
      [1, 0],
    ]);
    const adj = JSON.parse((await runInProcess(['leg', '--topology', 'npc', '--level-steps', 'adjacent', '--json'])).stdout);
    expect(adj.phases.a.moves['+']).toEqual([
      [-1, 0],
      [0, -1],
      [0, 1],
      [1, 0],
    ]);
  });

  it('vectors --json reports the admissible tiling and its reach beside the hull radius', async () => {
    const r = await runInProcess(['vectors', '--topology', 'npc', '--fault', 'a.clampUpper', '--polarity', '++-', '--json']);
    const d = JSON.parse(r.stdout);
    expect(d.reach).toBe(0);
    expect(d.radius).toBeCloseTo(2 / Math.sqrt(3), 12);
    expect(d.outline.length).toBeGreaterThan(0);
  });

  it("check fails a claim that only the hull would grant, and honours a claim's levelSteps", () => {
    const claims = join(dir, 'claims.json');
    writeFileSync(
      claims,
      JSON.stringify({
        claims: [
          { name: 'clamp diode, first-version promise', topology: 'npc', faults: ['a.clampUpper'], m: 1.1, loadAngleDeg: [0, 30] },
          { name: 'T-type neutral switch, commutable', topology: 'tnpc', faults: ['a.neutralToOut'], m: 1.1, loadAngleDeg: [0, 30] },
          { name: 'T-type neutral switch, adjacent', topology: 'tnpc', faults: ['a.neutralToOut'], m: 1.1, loadAngleDeg: [0, 30], levelSteps: 'adjacent' },
        ],
      }),
    );
    const r = runBin(['check', claims, '--json']);
    expect(r.code).toBe(1);
    expect(JSON.parse(r.stdout).claims.map((c: { holds: boolean }) => c.holds)).toEqual([false, true, false]);
    const text = runBin(['check', claims]);
    expect(text.stdout).toContain('hull limit');
    // without the ratings the overstressing P↔N change counts as commutable again: the first
    // version's verdict comes back, and the text warns that it does not show the hardware survives
    const relaxed = runBin(['check', claims, '--ignore-ratings', '--json']);
    expect(JSON.parse(relaxed.stdout).claims[0].holds).toBe(true);
    expect(runBin(['check', claims, '--ignore-ratings']).stdout).toContain('judged with relaxed rules');
  });

  it('table never uses pattern P in phase a while its current is positive with innerUpper open', async () => {
    const r = await runInProcess(['table', '--topology', 'npc', '--fault', 'a.innerUpper', '--json']);
    const t = JSON.parse(r.stdout);
    for (const [pol, p] of Object.entries(t.polarities) as [
      string,
      { tableTriangles: { vertices: { realisations: { phases: { pattern: string }[] }[] }[] }[] },
    ][]) {
      if (pol[0] !== '+') continue;
      for (const tri of p.tableTriangles) for (const v of tri.vertices) for (const rz of v.realisations) expect(rz.phases[0]!.pattern).not.toBe('P');
    }
  });

  it('the review report states the rules, the hull bound and that the drive cannot run', async () => {
    const out = join(dir, 'clamp.html');
    const r = await runInProcess(['report', '--topology', 'npc', '--fault', 'a.clampUpper', '--load-angle', '25', '--out', out]);
    expect(r.code).toBe(0);
    const html = readFileSync(out, 'utf8');
    expect(html).toContain('device voltage ratings applied');
    expect(html).toContain('The drive cannot run in this state');
    expect(html).toContain('convex-hull bound (first version)');
    expect(html).toContain('outerUpper would block 2 × Vdc/2');
  });

  it('cycle agrees with mMaxBalanced on both sides of it', async () => {
    const plan = JSON.parse(
      (await runInProcess(['plan', '--topology', 'npc', '--fault', 'a.clampUpper', '--load-angle', '25', '--level-steps', 'any', '--json'])).stdout,
    );
    expect(plan.mMaxBalanced).toBeGreaterThan(0.5);
    expect(plan.mMaxBalanced).toBeLessThan(1.1);
    const run = async (m: number) =>
      JSON.parse(
        (
          await runInProcess([
            'cycle',
            '--topology',
            'npc',
            '--fault',
            'a.clampUpper',
            '--load-angle',
            '25',
            '--level-steps',
            'any',
            '--m',
            String(m),
            '--json',
          ])
        ).stdout,
      );
    expect((await run(1.1)).midpointDrift).toBe(true);
    expect((await run(plan.mMaxBalanced - 1e-3)).midpointDrift).toBe(false);
    expect((await run(plan.mMaxBalanced + 1e-3)).midpointDrift).toBe(true);
  });

  it.each([
    [['plan', '--topology', 'npc', '--level-steps', 'sometimes'], 'one of commutable, adjacent, any'],
    [['plan', '--topology', 'npc', '--ignore-ratings=yes'], 'no value'],
  ])('exits 2 with one line for %j', (argv, hint) => {
    const r = runBin(argv);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(hint);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
  });
});
