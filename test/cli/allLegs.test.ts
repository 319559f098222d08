import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { XMLValidator } from 'fast-xml-parser';
import { describe, expect, it } from 'vitest';
import { BUILTIN_TOPOLOGIES, builtinLeg } from '@hexsalvage/core';
import { expandElements } from '@hexsalvage/core/internal';
import { runBin, runInProcess } from '../support/cli.js';

const dir = mkdtempSync(join(tmpdir(), 'hexsalvage-all-'));

describe('every plot kind and the report for every built-in leg', () => {
  it.each(BUILTIN_TOPOLOGIES)('works for %s with its first element open', async (t) => {
    const fault = `b.${expandElements(builtinLeg(t))[0]!.id}`;
    for (const kind of ['diagram', 'sectors', 'derating', 'leg', 'sequence']) {
      const out = join(dir, `${t}-${kind}.svg`);
      expect((await runInProcess(['plot', kind, '--topology', t, '--fault', fault, '--load-angle', '15', '--out', out])).code).toBe(0);
      expect(XMLValidator.validate(readFileSync(out, 'utf8'))).toBe(true);
    }
    const atlasSvg = join(dir, `${t}-atlas.svg`);
    expect((await runInProcess(['plot', 'atlas', '--topology', t, '--step', '20', '--out', atlasSvg])).code).toBe(0);
    expect(XMLValidator.validate(readFileSync(atlasSvg, 'utf8'))).toBe(true);
    const html = join(dir, `${t}.html`);
    expect((await runInProcess(['report', '--topology', t, '--fault', fault, '--out', html])).code).toBe(0);
    expect(readFileSync(html, 'utf8')).toContain('Remedial operation review');
  });
});

describe('hexsalvage cycle', () => {
  it('reports volt-second balance and flags midpoint drift', async () => {
    const r = await runInProcess(['cycle', '--topology', 'tnpc', '--fault', 'a.neutralToOut', '--m', '1.1', '--load-angle', '80', '--ratio', '240', '--json']);
    expect(r.code).toBe(0);
    const d = JSON.parse(r.stdout);
    // volt-seconds exact but where a chain of one-phase steps had to be inserted
    if (d.chainSteps === 0) expect(d.voltSecondErrorMax).toBeLessThan(1e-12);
    expect(d.midpointDrift).toBe(true);
    expect(d.midpointCurrent.runtime).toBeGreaterThan(0.05);
    const ok = JSON.parse((await runInProcess(['cycle', '--topology', 'npc', '--m', '1', '--load-angle', '30', '--json'])).stdout);
    expect(ok.midpointDrift).toBe(false);
  });
  it('refuses an m above the limit with one line', () => {
    const r = runBin(['cycle', '--topology', 'npc', '--fault', 'a.outerUpper', '--m', '0.9']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('at most mMax = 0.577350');
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
  });
});

describe('vectors, plan and sweep on a netlist file', () => {
  const five = 'examples/five-level-leg.json';
  it('print the contract documents', async () => {
    const v = JSON.parse((await runInProcess(['vectors', '--topology', five, '--fault', 'a.s1', '--polarity', '+-?', '--json'])).stdout);
    expect(v.vectors.length).toBeGreaterThan(19);
    const p = JSON.parse((await runInProcess(['plan', '--topology', five, '--fault', 'a.s1', '--load-angle', '20', '--json'])).stdout);
    expect(p.mMax).toBeLessThanOrEqual(p.mMaxHealthy);
    expect(p.mMaxHealthy).toBeCloseTo(2 / Math.sqrt(3), 12);
    const s = JSON.parse((await runInProcess(['sweep', '--topology', five, '--fault', 'a.s1', '--step', '30', '--json'])).stdout);
    expect(s.points.length).toBeGreaterThanOrEqual(7);
  });
});
