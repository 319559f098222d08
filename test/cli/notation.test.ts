import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { deratingCurve, levelNotation, parseNetlist, planRemedial } from '@hexsalvage/core';
import { diagramAtlas, vectorName } from '@hexsalvage/core/internal';
import { deratingCurveSvg, vectorDiagramSvg } from '@hexsalvage/plot';
import { ROOT, runInProcess } from '../support/cli.js';

const FIVE = join(ROOT, 'examples', 'five-level-leg.json');

describe('one notation for levels and vectors', () => {
  it('writes letters only on a P/O/N (or P/N) leg, signed numbers with "/" otherwise', () => {
    expect(levelNotation([-1, 0, 1]).triplet([0, -1, -1])).toBe('ONN');
    expect(levelNotation([1, -1]).triplet([1, -1, -1])).toBe('PNN');
    expect(vectorName([0.5, 0, -1], [-1, -0.5, 0, 0.5, 1])).toBe('+0.5/0/-1');
    expect(levelNotation([-1, -0.5, 0, 0.5, 1]).level(1)).toBe('+1');
    // a leg at another scale is not P/O/N even though it has three levels
    expect(levelNotation([-2, 0, 2]).triplet([2, 0, -2])).toBe('+2/0/-2');
    expect(levelNotation([-1, 0, 1]).letters).toBe(true);
  });

  it('plan, vectors, check and table write the same vector the same way', async () => {
    const plan = (await runInProcess(['plan', '--topology', 'npc', '--fault', 'a.outerUpper'])).stdout;
    expect(plan).toContain('small vector ONN');
    expect(plan).toContain('medium vector OPN');
    const vectors = (await runInProcess(['vectors', '--topology', 'npc', '--fault', 'a.outerUpper', '--polarity', '+--'])).stdout;
    expect(vectors).toMatch(/small\s+ONN/);
    expect(vectors).not.toMatch(/0\/-1\/-1/);
    const table = (await runInProcess(['table', '--topology', 'npc', '--fault', 'a.outerUpper', '--polarity', '+--'])).stdout;
    expect(table).toContain('ONN');
    const five = (await runInProcess(['table', '--topology', FIVE, '--polarity', '+--'])).stdout;
    // five-level states are separated, never run together ("0.50.5O+2" was the old defect)
    expect(five).toMatch(/\+0\.5\/[+-]?[0-9.]+\/[+-]?[0-9.]+/);
    expect(five).not.toMatch(/[0-9]O|O[+0-9]/);
  });

  it('the five-level diagram leaves out labels that would overlap, and says so', () => {
    const leg = parseNetlist(JSON.parse(readFileSync(FIVE, 'utf8')), 'five-level-leg.json');
    const plan = planRemedial({ topology: leg });
    const svg = vectorDiagramSvg(plan, plan.limitingPolarity);
    // a label anchored at its end (text-anchor="end") extends to the left of x
    const labels = [...svg.matchAll(/<text class="label[^"]*" x="([\d.]+)" y="([\d.]+)"( text-anchor="end")?[^>]*>([^<]*)<\/text>/g)].map((m) => {
      const w = 5.6 * m[4]!.replace(/&[a-z]+;/g, '&').length;
      return { x: m[3] ? Number(m[1]) - w : Number(m[1]), y: Number(m[2]), w };
    });
    expect(labels.length).toBeGreaterThan(10);
    for (let i = 0; i < labels.length; i++)
      for (let j = i + 1; j < labels.length; j++) {
        const a = labels[i]!;
        const b = labels[j]!;
        const overlap = a.x < b.x + b.w && b.x < a.x + a.w && a.y - 8 < b.y + 1 && b.y - 8 < a.y + 1;
        expect(overlap, `labels ${i} and ${j}`).toBe(false);
      }
    expect(svg).toContain('labels left out where they would overlap');
    expect(svg).toContain('separated by &quot;/&quot;');
  });

  it('the derating plot shows the breakpoint legend only with breakpoints, and marks the operating angle and range', () => {
    const flat = deratingCurve(diagramAtlas({ topology: 'npc' }), { stepDeg: 10 });
    expect(flat.some((p) => p.breakpoint)).toBe(false);
    expect(deratingCurveSvg([{ label: 'healthy', points: flat }])).not.toContain('computed breakpoint');
    const bent = deratingCurve(diagramAtlas({ topology: 'npc', faults: ['a.outerUpper.diode'] }), { stepDeg: 10 });
    const svg = deratingCurveSvg([{ label: 'x', points: bent }], { operatingDeg: 25, bandDeg: [10, 40], vdc: 750 });
    expect(svg).toContain('computed breakpoint');
    expect(svg).toContain('class="operating-point"');
    expect(svg).toContain('class="operating-band"');
    expect(svg).toContain('operating range 10.0° to 40.0°');
    expect(svg).toMatch(/class="tick volts"[^>]*>459 V</);
  });
});
