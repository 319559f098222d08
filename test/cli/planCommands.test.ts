import { describe, expect, it } from 'vitest';
import { planRemedial, POLARITY_STRINGS } from '@hexsalvage/core';
import { runBin, runInProcess } from '../support/cli.js';

describe('hexsalvage vectors', () => {
  it('prints the contract keys for one polarity', async () => {
    const r = await runInProcess(['vectors', '--topology', 'npc', '--fault', 'a.outerUpper', '--polarity', '+--', '--json']);
    expect(r.code).toBe(0);
    const d = JSON.parse(r.stdout);
    expect(Object.keys(d)).toEqual(expect.arrayContaining(['polarity', 'vectors', 'hull', 'triangles', 'radius']));
    expect(d.polarity).toBe('+--');
    expect(d.vectors[0]).toEqual(expect.objectContaining({ alpha: expect.any(Number), beta: expect.any(Number), levels: expect.any(Array) }));
    for (const t of d.triangles) for (const i of t) expect(i).toBeLessThan(d.vectors.length);
    expect(d.radius).toBeCloseTo(1 / Math.sqrt(3), 12);
  });
  it('prints a readable diagram summary with lost vectors', async () => {
    const r = await runInProcess(['vectors', '--topology', 'tnpc', '--fault', 'a.upper', '--polarity', '+-?']);
    expect(r.stdout).toContain('Lost vectors');
    expect(r.stdout).toContain('Radius');
  });
});

describe('hexsalvage plan', () => {
  it('prints the same object planRemedial returns', async () => {
    const r = await runInProcess(['plan', '--topology', 'anpc-hybrid', '--fault', 'a.innerUpper', '--load-angle', '25', '--polarity-margin', '4', '--json']);
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.stdout);
    expect(doc).toEqual(
      JSON.parse(JSON.stringify(planRemedial({ topology: 'anpc-hybrid', faults: ['a.innerUpper'], loadAngleDeg: 25, polarityMarginDeg: 4 }))),
    );
    expect(Object.keys(doc.polarities).sort()).toEqual([...POLARITY_STRINGS].sort());
    expect(doc.deratingRatio).toBeCloseTo(doc.mMax / doc.mMaxHealthy, 12);
  });
  it('drains a large JSON document through a pipe completely', () => {
    const r = runBin(['plan', '--topology', 'examples/five-level-leg.json', '--fault', 'a.s2', '--json']);
    expect(r.code).toBe(0);
    expect(r.stdout.length).toBeGreaterThan(200000);
    expect(JSON.parse(r.stdout).topology).toBe('five-level-diode-clamped');
  });
  it('prints a readable summary with the binding edge and the cautions', async () => {
    const r = await runInProcess(['plan', '--topology', 'npc', '--fault', 'a.outerUpper']);
    expect(r.stdout).toMatch(/Maximum modulation index \(faulted, safe\): +0\.577350/);
    expect(r.stdout).toContain('on the outline edge between');
    expect(r.stdout).toContain('Rules: device voltage ratings applied');
    expect(r.stdout).toContain('Cautions:');
  });
});

describe('hexsalvage sweep', () => {
  it('prints CSV with a header and one row per point', async () => {
    const r = await runInProcess(['sweep', '--topology', 'npc', '--fault', 'a.outerUpper.diode', '--from', '-30', '--to', '30', '--step', '10', '--csv']);
    const lines = r.stdout.trim().split('\n');
    expect(lines[0]).toBe('load_angle_deg,m_max,derating_ratio,limiting_angle_deg,limiting_polarity,breakpoint,m_max_hull,derating_edge');
    expect(lines.length).toBeGreaterThanOrEqual(8);
  });
  it('prints JSON points', async () => {
    const r = await runInProcess(['sweep', '--topology', 'tnpc', '--fault', 'a.upper', '--step', '30', '--json']);
    const d = JSON.parse(r.stdout);
    expect(d.points.map((p: { loadAngleDeg: number }) => p.loadAngleDeg)).toEqual(expect.arrayContaining([-90, -60, -30, 0, 30, 60, 90]));
  });
});

describe('bad input to vectors, plan and sweep', () => {
  it.each([
    [['vectors', '--topology', 'npc', '--polarity', '+++'], 'not +++ or ---'],
    [['vectors', '--topology', 'npc', '--polarity', '+x-'], 'three characters'],
    [['vectors', '--topology', 'npc'], '--polarity'],
    [['plan', '--topology', 'npc', '--load-angle', '200'], 'from -180 to 180'],
    [['plan', '--topology', 'npc', '--load-angle', 'NaN'], 'a decimal number'],
    [['plan', '--topology', 'npc', '--polarity-margin', '60'], '[0, 60)'],
    [['plan', '--topology', 'npc', '--load-angle'], 'a value'],
    [['sweep', '--topology', 'npc', '--step', '0'], 'above 0'],
    [['sweep', '--topology', 'npc', '--from', '50', '--to', '10'], '--to'],
  ])('exits 2 with one line for %j', (argv, hint) => {
    const r = runBin(argv);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(hint);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
  });
});
