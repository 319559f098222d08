import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { XMLValidator } from 'fast-xml-parser';
import { describe, expect, it } from 'vitest';
import { evaluateClaim, modulationLimit } from '@hexsalvage/core';
import { diagramAtlas } from '@hexsalvage/core/internal';
import { ROOT, runBin, runInProcess } from '../support/cli.js';

const dir = mkdtempSync(join(tmpdir(), 'hexsalvage-report-'));

describe('hexsalvage plot', () => {
  it.each(['diagram', 'sectors', 'derating', 'leg', 'sequence'])('writes a %s SVG for a built-in leg and for a netlist file', async (kind) => {
    for (const [topology, fault] of [
      ['tnpc', 'b.neutralToOut'],
      [join(ROOT, 'examples/five-level-leg.json'), 'a.s2'],
    ] as const) {
      const out = join(dir, `${kind}-${fault}.svg`);
      const r = await runInProcess(['plot', kind, '--topology', topology, '--fault', fault, '--load-angle', '20', '--out', out]);
      expect(r.code).toBe(0);
      expect(XMLValidator.validate(readFileSync(out, 'utf8'))).toBe(true);
    }
  });
  it('renders PNG with a general-purpose rasteriser', async () => {
    const out = join(dir, 'diagram.png');
    expect((await runInProcess(['plot', 'diagram', '--topology', 'npc', '--fault', 'a.outerUpper', '--out', out])).code).toBe(0);
    expect([...readFileSync(out).subarray(0, 8)]).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
  });
  it.each([
    [['plot', 'pie', '--topology', 'npc', '--out', 'x.svg'], 'one of diagram'],
    [['plot', 'diagram', '--topology', 'npc', '--out', 'x.pdf'], '.svg or .png'],
    [['plot', 'leg', '--topology', 'npc', '--pattern', 'Q', '--out', join(tmpdir(), 'x.svg')], 'one of P, O, N'],
    [['plot', 'sequence', '--topology', 'npc', '--triangle', '99', '--out', join(tmpdir(), 'x.svg')], 'triangle index'],
  ])('exits 2 with one line for %j', (argv, hint) => {
    const r = runBin(argv);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(hint);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
  });
});

describe('hexsalvage check', () => {
  it('gives the contract JSON and exit 1 when a claim fails', () => {
    const r = runBin(['check', 'examples/pump-claims.json', '--json']);
    expect(r.code).toBe(1);
    const d = JSON.parse(r.stdout);
    expect(d.claims).toHaveLength(3);
    for (const c of d.claims) expect(Object.keys(c)).toEqual(expect.arrayContaining(['name', 'holds', 'worstLoadAngleDeg', 'mMaxAtWorst', 'shortfall']));
    expect(d.claims.map((c: { holds: boolean }) => c.holds)).toEqual([true, false, true]);
    expect(d.claims[1].shortfall).toBeCloseTo(d.claims[1].m - d.claims[1].mMaxAtWorst, 12);
  });
  it('exits 0 when every claim holds, and reads netlist paths relative to the claims file', () => {
    const sub = join(dir, 'claims');
    mkdirSync(sub, { recursive: true });
    writeFileSync(join(sub, 'leg.json'), readFileSync(join(ROOT, 'examples/five-level-leg.json')));
    writeFileSync(join(sub, 'ok.json'), JSON.stringify({ claims: [{ name: 'five', topology: 'leg.json', faults: ['a.s1'], m: 0.5, loadAngleDeg: [0, 30] }] }));
    const r = runBin(['check', join(sub, 'ok.json')]);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('HOLDS');
  });
  it('agrees with the minimum of mMax over the range', () => {
    const v = evaluateClaim({ name: 'x', topology: 'npc', faults: ['a.outerUpper.diode'], m: 0.7, loadAngleDeg: [-10, 35], polarityMarginDeg: 2 });
    const atlas = diagramAtlas({ topology: 'npc', faults: ['a.outerUpper.diode'] });
    let sampled = Infinity;
    for (let phi = -10; phi <= 35; phi += 0.05) sampled = Math.min(sampled, modulationLimit(atlas.faulted, phi, 2).mMax);
    expect(v.mMaxAtWorst).toBeLessThanOrEqual(sampled + 1e-12);
    expect(sampled - v.mMaxAtWorst).toBeLessThan(2e-3);
    expect(v.holds).toBe(v.mMaxAtWorst >= 0.7);
  });
  it.each([
    ['{"claims": []}', 'claims: expected a non-empty array'],
    ['{"claims": [{"name": "a", "topology": "npc", "faults": [], "m": "big", "loadAngleDeg": [0, 1]}]}', 'claims[0].m'],
    ['{"claims": [{"name": "a", "topology": "npc", "faults": [], "m": 1, "loadAngleDeg": [10, 1]}]}', 'claims[0].loadAngleDeg'],
    ['{"claims": [{"name": "a", "topology": "npc", "faults": ["a.nope"], "m": 1, "loadAngleDeg": [0, 1]}]}', 'one of outerUpper'],
    ['{"claims": [{"name": "a", "topology": "missing.json", "faults": [], "m": 1, "loadAngleDeg": [0, 1]}]}', 'claims[0] ("a").topology'],
    ['{"claims": [{"name": "a", "topology": "npc", "faults": [], "m": 1, "loadAngleDeg": [0, 1], "extra": 1}]}', 'claims[0].extra'],
    ['not json', 'valid JSON'],
  ])('exits 2 with one line for %s', (text, hint) => {
    const f = join(dir, `bad-${Math.abs(hash(text))}.json`);
    writeFileSync(f, text);
    const r = runBin(['check', f]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(hint);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
  });
});

describe('hexsalvage report', () => {
  it('writes one self-contained HTML file with the cautions, the limit, every plot and the claims', async () => {
    const out = join(dir, 'review.html');
    const r = await runInProcess([
      'report',
      '--topology',
      'anpc-hybrid',
      '--fault',
      'a.innerUpper',
      '--load-angle',
      '25',
      '--claims',
      join(ROOT, 'examples/pump-claims.json'),
      '--out',
      out,
    ]);
    expect(r.code).toBe(0);
    const html = readFileSync(out, 'utf8');
    expect(html).toContain('Caution');
    expect(html).toContain('0.577350');
    expect(html).toContain('The limit binds at θ =');
    expect(html.match(/<svg /g)?.length).toBeGreaterThanOrEqual(5);
    expect(html).toContain('line-frequency devices driven at PWM rate');
    expect(html).toContain('FAILS');
    expect(html).not.toMatch(/(src|href)="https?:/);
    expect(html).not.toContain('<script');
    const ids = [...html.matchAll(/ id="([^"]+)"/g)].map((m) => m[1]);
    expect(new Set(ids).size).toBe(ids.length);
  });
  it('works for a netlist file', async () => {
    const out = join(dir, 'five.html');
    expect((await runInProcess(['report', '--topology', join(ROOT, 'examples/five-level-leg.json'), '--fault', 'c.s6', '--out', out])).code).toBe(0);
  });
});

function hash(s: string): number {
  let h = 0;
  for (const c of s) h = (h * 31 + c.charCodeAt(0)) | 0;
  return h;
}
