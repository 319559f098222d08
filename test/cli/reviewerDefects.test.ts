import { spawnSync } from 'node:child_process';
import { cpSync, mkdirSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import {
  analyseLeg,
  BUILTIN_TOPOLOGIES,
  builtinLeg,
  deratingCurve,
  evaluateClaim,
  faultAtlas,
  formatFault,
  planRemedial,
  simulatePeriod,
  simulationWaveform,
  switchingTable,
  type FaultMode,
} from '@hexsalvage/core';
import { diagramAtlas, limitOverLoadAngles, planFromAtlas } from '@hexsalvage/core/internal';
import { loadNetlistFile } from '@hexsalvage/core/node';
import { deratingCurveSvg, legSchematicSvg, sectorOverviewSvg, vectorDiagramSvg, waveformsSvg } from '@hexsalvage/plot';
import { buildReport } from '../../packages/cli/src/report/buildReport.js';
import { schematicFocus } from '../../packages/cli/src/schematicFocus.js';
import { BIN, ROOT, runInProcess } from '../support/cli.js';

// What a design reviewer tripped over, item by item (each test failed before its fix).
const dir = mkdtempSync(join(tmpdir(), 'hexsalvage-review-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const five = loadNetlistFile(join(ROOT, 'examples/five-level-leg.json'));

describe('1. the pair atlas names the phases of the pair', () => {
  it.each(['anpc', 'npc', 'tnpc'])('%s, opens and shorts: every reason and detail names only faulted phases', (topology) => {
    const a = faultAtlas({ topology, pairs: true });
    expect(a.entries.length).toBeGreaterThan(1000);
    for (const e of a.entries) {
      const phases = new Set(e.faults.map((f) => f[0]));
      for (const text of [e.reason, ...e.details])
        for (const m of text.matchAll(/phase ([abc])/g)) expect(phases.has(m[1] as string), `${e.faults.join(' + ')}: ${text}`).toBe(true);
    }
  });
  it('the case of the review: b.outerUpper + c.innerLower open', () => {
    const e = faultAtlas({ topology: 'anpc', modes: ['open'], pairs: true }).entries.find((x) => x.faults.join() === 'b.outerUpper:open,c.innerLower:open');
    expect(e?.details).toEqual(expect.arrayContaining(['phase c loses N for i < 0', 'phase b loses P for i > 0']));
  });
});

describe('2–3. the leg drawing: shorts, shoot-through and unsafe paths', () => {
  it('a short is drawn as a short, never crossed out as open', () => {
    const a = analyseLeg({ topology: 'npc', faults: ['a.innerUpper:short'] });
    const svg = legSchematicSvg(a.leg, schematicFocus(a, 'a', 'O', '+'));
    expect(svg).toContain('class="short-mark"');
    expect(svg).toContain('innerUpper · SHORT');
    expect(svg).not.toContain('class="failed-mark"');
    expect(svg).not.toContain('OPEN</text>');
  });
  it('a pattern that shoots through with the short says so and draws the path, not "no path"', () => {
    const a = analyseLeg({ topology: 'npc', faults: ['a.innerUpper:short'] });
    const svg = legSchematicSvg(a.leg, schematicFocus(a, 'a', 'N', '+'));
    expect(svg).toContain('class="caption shoot-through"');
    expect(svg).toMatch(/shoot-through O→N via clampUpper, innerUpper, innerLower, outerLower/);
    expect(svg).not.toContain('no path');
    expect((svg.match(/class="conduction"/g) ?? []).length).toBe(4);
  });
  it('npc a.clampUpper, pattern O, i > 0: the current freewheels to N and outerUpper would block 2 × Vdc/2 (not "no path")', () => {
    const a = analyseLeg({ topology: 'npc', faults: ['a.clampUpper'] });
    const focus = schematicFocus(a, 'a', 'O', '+');
    expect(focus.state).toBe('unsafe');
    expect(focus.path).toEqual(expect.arrayContaining(['innerLower.diode', 'outerLower.diode']));
    const svg = legSchematicSvg(a.leg, focus);
    expect(svg).toContain('outerUpper would block 2 × Vdc/2 (rating 1 × Vdc/2)');
    expect(svg).not.toContain('no path');
  });
  it('every built-in leg, single open fault, pattern and sign: the drawn path never runs through an element marked open', () => {
    let cases = 0;
    for (const topology of BUILTIN_TOPOLOGIES) {
      const leg = builtinLeg(topology);
      const elements = leg.devices.flatMap((d) => (d.antiparallelDiode ? [d.id, `${d.id}.diode`] : [d.id]));
      for (const el of elements) {
        const a = analyseLeg({ topology, faults: [`a.${el}`] });
        for (const p of Object.keys(leg.patterns)) {
          for (const sign of ['+', '-']) {
            const f = schematicFocus(a, 'a', p, sign);
            for (const x of f.path ?? []) expect(f.failed).not.toContain(x);
            cases++;
          }
        }
      }
    }
    expect(cases).toBeGreaterThan(200);
  });
  it('a long caption wraps inside the drawing (no line wider than the picture)', () => {
    const a = analyseLeg({ topology: 'npc', faults: ['a.clampUpper'] });
    const svg = legSchematicSvg(a.leg, schematicFocus(a, 'a', 'O', '+'));
    const lines = [...svg.matchAll(/<tspan x="12" dy="[\d.]+">([^<]*)<\/tspan>/g)].map((m) => m[1] as string);
    expect(lines.length).toBeGreaterThan(1);
    for (const l of lines) expect(l.length * 7).toBeLessThanOrEqual(600 - 12);
  });
});

describe('4. unsafe rules never say "safe"', () => {
  it('plan --ignore-ratings --level-steps any says NOT safe and why', async () => {
    const r = await runInProcess(['plan', '--topology', 'npc', '--fault', 'a.outerUpper', '--ignore-ratings', '--level-steps', 'any']);
    expect(r.stdout).not.toContain('(faulted, safe)');
    expect(r.stdout).toContain('Maximum modulation index (faulted, NOT safe):  0.577350');
    expect(r.stdout).toContain('NOT a safe operating limit: device voltage ratings ignored; level changes not checked for a safe commutation');
  });
  it('the default rules still say safe, at the same column', async () => {
    const r = await runInProcess(['plan', '--topology', 'npc', '--fault', 'a.outerUpper']);
    expect(r.stdout).toContain('Maximum modulation index (faulted, safe):      0.577350');
  });
  it('the report says NOT safe under relaxed rules', () => {
    const atlas = diagramAtlas({ topology: 'npc', faults: ['a.outerUpper'], ignoreRatings: true });
    const html = buildReport({
      atlas,
      plan: planFromAtlas(atlas, 0, 0),
      table: switchingTable({ topology: 'npc', faults: ['a.outerUpper'], ignoreRatings: true }),
      topologyText: 'npc',
      generatedBy: 'test',
    });
    expect(html).toContain('faulted (NOT safe)');
    expect(html).toContain('These figures are NOT a safe operating limit');
  });
});

describe('5. claims on unrated legs say the ratings were not checked', () => {
  it('check: the five-level claim reads "ratings NOT checked" and the JSON lists the unrated devices', async () => {
    const t = await runInProcess(['check', join(ROOT, 'examples/pump-claims.json')]);
    expect(t.stdout).toContain('ratings NOT checked (no device rated)');
    expect(t.stdout).toMatch(/NOTE: five-level test leg, s1 open, light load: devices without a voltage rating were not checked/);
    const j = JSON.parse((await runInProcess(['check', join(ROOT, 'examples/pump-claims.json'), '--json'])).stdout) as {
      claims: { name: string; unrated: string[]; deviceCount: number }[];
    };
    const c = j.claims.find((x) => x.name.startsWith('five-level'));
    expect(c?.unrated).toHaveLength(14);
    expect(c?.deviceCount).toBe(14);
    expect(j.claims.filter((x) => x.name.startsWith('circulation')).every((x) => x.unrated.length === 0)).toBe(true);
  });
});

describe('6. "worst at" on a flat curve is the lowest angle of the range, rounded', () => {
  it('atlas: every full-voltage and every flat entry is worst at the range low end', () => {
    for (const topology of ['anpc', 'npc', 'tnpc']) {
      for (const e of faultAtlas({ topology }).entries) {
        const flat = e.mMaxAt.every(([, m]) => Math.abs(m - e.mMaxMin) < 1e-9);
        if (flat) expect(e.worstLoadAngleDeg, `${topology} ${e.faults.join()}`).toBe(-90);
        expect(Math.round(e.worstLoadAngleDeg * 1e9) / 1e9).toBe(e.worstLoadAngleDeg);
      }
    }
  });
  it('a claim on a flat range: worst at LO exactly (not −59.999999999999986)', () => {
    for (const [lo, hi] of [
      [-60, 60],
      [-20, 20],
      [10, 40],
    ] as const) {
      const v = evaluateClaim({ name: 'flat', topology: 'anpc', faults: ['a.outerUpper'], m: 0.5, loadAngleDeg: [lo, hi] });
      expect(v.worstLoadAngleDeg).toBe(lo);
    }
  });
  it('the lowest angle is still a worst one where the curve is not flat (sampled check, 0.25° grid)', () => {
    const atlas = diagramAtlas({ topology: 'npc', faults: ['a.outerUpper.diode'] });
    for (const [lo, hi] of [
      [-90, 90],
      [-10, 50],
      [5, 80],
    ] as const) {
      const r = limitOverLoadAngles(atlas.faulted, lo, hi, 0);
      let best = Infinity;
      let at = lo;
      for (let phi = lo; phi <= hi + 1e-9; phi += 0.25) {
        const m = planFromAtlas(atlas, phi, 0).mMax;
        if (m < best - 1e-12) [best, at] = [m, phi];
      }
      expect(r.mMax).toBeCloseTo(best, 9);
      expect(planFromAtlas(atlas, r.loadAngleDeg, 0).mMax).toBeCloseTo(r.mMax, 9);
      expect(r.loadAngleDeg).toBeLessThanOrEqual(at + 1e-9);
    }
  });
});

describe("7. the demo claims are stated in the drive's terms", () => {
  it('examples/pump-claims.json: 60 % speed holds, 80 % speed (320 V under V/f) fails, exit 1', async () => {
    const r = await runInProcess(['check', join(ROOT, 'examples/pump-claims.json'), '--json']);
    expect(r.code).toBe(1);
    const j = JSON.parse(r.stdout) as { claims: { name: string; holds: boolean; m: number }[] };
    expect(j.claims.filter((c) => !c.holds).map((c) => c.name)).toEqual(['circulation pump, SiC switch open, 80 % speed (V/f: 320 V)']);
    // m = 320 / (375 · √(3/2)) (contract: Physical units)
    expect(j.claims[1]?.m).toBeCloseTo(320 / (375 * Math.sqrt(1.5)), 12);
  });
  it('the report states what the rated voltage needs against what is left', async () => {
    const out = join(dir, 'pump.html');
    const r = await runInProcess(['report', '--scenario', join(ROOT, 'examples/pump-scenario.json'), '--out', out]);
    expect(r.code).toBe(0);
    const html = readFileSync(out, 'utf8');
    // 400 / (375 · √1.5) = 0.8709; 2/√3/2 · 375 · √1.5 = 265.2 V = 66 % of 400 V
    expect(html).toContain('Rated line voltage 400 V RMS needs m = 0.8709 at Vdc = 750 V');
    expect(html).toContain('the rated voltage is NOT available: at most 66 % of it');
  });
});

describe('8. the claims table fits an A4 page', () => {
  it('fixed layout, columns summing to 100 %', async () => {
    const out = join(dir, 'claims.html');
    await runInProcess(['report', '--topology', 'anpc-hybrid', '--fault', 'a.innerUpper', '--claims', join(ROOT, 'examples/pump-claims.json'), '--out', out]);
    const html = readFileSync(out, 'utf8');
    const cols = /<table class="claims"><colgroup>(.*?)<\/colgroup>/.exec(html)?.[1] ?? '';
    const widths = [...cols.matchAll(/width:(\d+)%/g)].map((m) => Number(m[1]));
    expect(widths).toHaveLength(9);
    expect(widths.reduce((a, b) => a + b, 0)).toBe(100);
    expect(html).toMatch(/\.claims \{ width: 100%; table-layout: fixed;/);
  });
});

describe('9. the sector plot', () => {
  const plan = planRemedial({ topology: 'anpc-hybrid', faults: ['a.innerUpper'], loadAngleDeg: 25 });
  const svg = sectorOverviewSvg(plan);
  it('one panel per polarity sector: the sector across 0° is joined', () => {
    expect(plan.sectors).toHaveLength(7);
    expect((svg.match(/<g class="sector/g) ?? []).length).toBe(6);
    expect(svg).toContain('θ 355.0°–55.0°');
  });
  it("the minimum extent is an arc over the sector's range with the point where it is reached, never a full circle, and it is explained", () => {
    expect((svg.match(/class="min-extent"/g) ?? []).length).toBe(6);
    expect(svg).not.toMatch(/<circle cx="[\d.]+" cy="[\d.]+" r="[\d.]+" fill="none" stroke="#009E73"/);
    expect(svg).toContain('min r, the shortest reach of those triangles within the sector');
  });
});

describe('10. a cannot-run verdict reads as a stop, with its reason', () => {
  it('plan tnpc a.neutralToOut adjacent: CANNOT RUN at any load angle, and why', async () => {
    const r = await runInProcess(['plan', '--topology', 'tnpc', '--fault', 'a.neutralToOut', '--level-steps', 'adjacent']);
    expect(r.stdout).toContain('CANNOT RUN in this state at any load angle');
    expect(r.stdout).toMatch(
      /Why: with currents ia > 0, ib < 0, ic < 0 \(polarity \+--\), no admissible triangle covers the directions 60° to 120° and 240° to 300° next to the origin/,
    );
    expect(r.stdout).toContain('phase a loses O for i > 0');
  });
  it('the plan carries the reason as data; stop is null where the leg runs', () => {
    const p = planRemedial({ topology: 'tnpc', faults: ['a.neutralToOut'], levelSteps: 'adjacent' });
    expect(p.stop?.gapsDeg).toEqual([
      [60, 120],
      [240, 300],
    ]);
    expect(planRemedial({ topology: 'npc', faults: ['a.outerUpper'] }).stop).toBeNull();
  });
  it('cannot run at one load angle ⇒ at every load angle (every polarity occurs at every angle): sampled', () => {
    for (const [topology, f] of [
      ['tnpc', 'a.neutralToOut'],
      ['npc', 'a.clampUpper'],
      ['tnpc', 'a.upper:short'],
    ] as const) {
      const atlas = diagramAtlas({ topology, faults: [f], levelSteps: 'adjacent' });
      for (let phi = -180; phi <= 180; phi += 7.5) expect(planFromAtlas(atlas, phi, 0).mMax).toBe(0);
    }
  });
  it('the report of a leg that cannot run offers no export and draws no switching period', () => {
    const atlas = diagramAtlas({ topology: 'npc', faults: ['a.clampUpper'] });
    const plan = planFromAtlas(atlas, 0, 0);
    const html = buildReport({ atlas, plan, table: switchingTable({ topology: 'npc', faults: ['a.clampUpper'] }), topologyText: 'npc', generatedBy: 'test' });
    expect(html).not.toContain('Export with');
    expect(html).toContain('Nothing to run');
    expect(html).not.toContain('Switching period');
    expect(html).not.toContain('at this load angle');
    expect(html).toContain('cannot run in this state, at any load angle');
  });
});

describe('11. the derating plot hides no line', () => {
  const curve = (topology: string, faults: string[]) => {
    const a = diagramAtlas({ topology, faults, levelSteps: 'adjacent' });
    return { label: a.analysis.faults.map(formatFault).join(', '), points: deratingCurve(a, { stepDeg: 5 }) };
  };
  const svg = deratingCurveSvg([curve('tnpc', ['a.neutralToOut']), curve('tnpc', ['a.upper']), curve('tnpc', ['a.upper:short'])]);
  it('a curve on the x-axis is labelled cannot run, in the legend and on the plot', () => {
    expect(svg).toContain('cannot run at any load angle: a.neutralToOut:open, a.upper:short');
    expect((svg.match(/cannot run \(mMax = 0, on the axis\)/g) ?? []).length).toBe(2);
  });
  it('a hull bound on the healthy line is named', () => {
    expect(svg).toContain('convex-hull bound of a.neutralToOut:open: on the healthy line (not safe)');
  });
  it('the CLI legend keeps the mode', async () => {
    const out = join(dir, 'd.svg');
    await runInProcess(['plot', 'derating', '--topology', 'anpc-hybrid', '--fault', 'a.innerUpper', '--compare', 'a.innerUpper:short', '--out', out]);
    const s = readFileSync(out, 'utf8');
    expect(s).toContain('>a.innerUpper:open<');
    expect(s).toContain('a.innerUpper:short<tspan');
    expect(s).toContain('on the line of a.innerUpper:open');
  });
});

describe('12. the README tour runs as written on a fresh clone', () => {
  it('every line of the tour exits as its comment says, writing only into review/', () => {
    const readme = readFileSync(join(ROOT, 'README.md'), 'utf8');
    const block = /## A short tour\n\n```sh\n([\s\S]*?)```/.exec(readme)?.[1] ?? '';
    const lines = block.split('\n').filter((l) => l.startsWith('hs '));
    expect(lines.length).toBeGreaterThan(10);
    const clone = mkdtempSync(join(dir, 'clone-'));
    cpSync(join(ROOT, 'examples'), join(clone, 'examples'), { recursive: true });
    mkdirSync(join(clone, 'review'));
    for (const line of lines) {
      const command = line.replace(/\s+#.*$/, '');
      const r = spawnSync('bash', ['-c', `hs() { node ${JSON.stringify(BIN)} "$@"; }; ${command}`], {
        cwd: clone,
        encoding: 'utf8',
        maxBuffer: 64 * 1024 * 1024,
      });
      expect(r.status, `${command}\n${r.stderr}`).toBe(/exit 1/.test(line) ? 1 : 0);
    }
  });
  it('README says which commands take --json, and they do', async () => {
    const readme = readFileSync(join(ROOT, 'README.md'), 'utf8');
    const list = /Every command that prints results \(([^)]*)\)/.exec(readme)?.[1] ?? '';
    const names = [...list.matchAll(/`(\w+)`/g)].map((m) => m[1] as string);
    expect(names.length).toBeGreaterThanOrEqual(9);
    for (const c of names) expect((await runInProcess([c, '--help'])).stdout, c).toContain('--json');
  });
});

describe('13. vector diagram labels on the five-level leg', () => {
  const plan = planRemedial({ topology: five, faults: ['a.s1'] });
  const svg = vectorDiagramSvg(plan, plan.limitingPolarity);
  it('both ends of the binding edge are named', () => {
    expect((svg.match(/class="label binding-end"/g) ?? []).length).toBe(2);
    expect(svg).toContain('>+0.5/-1/-1</text>');
    expect(svg).toContain('>+0.5/+1/-1</text>');
  });
  it('the footnote wraps inside the picture; labels overlap no other label', () => {
    const width = Number(/<svg[^>]* width="(\d+)"/.exec(svg)?.[1]);
    const foot = [...svg.matchAll(/<text x="14" y="[\d.]+">([^<]*)<\/text>/g)].map((m) => m[1] as string);
    expect(foot.join(' ')).toContain('labels left out where they would overlap');
    for (const l of foot) expect(14 + l.replace(/&quot;/g, '"').length * 5.5).toBeLessThanOrEqual(width);
    const boxes = [...svg.matchAll(/<text class="label[^"]*" x="([\d.-]+)" y="([\d.-]+)"( text-anchor="end")?[^>]*>([^<]*)<\/text>/g)].map((m) => {
      const x = Number(m[1]);
      const y = Number(m[2]);
      const w = (m[4] as string).length * 5.6;
      return m[3] ? [x - w, y - 8, x, y + 2] : [x, y - 8, x + w, y + 2];
    });
    expect(boxes.length).toBeGreaterThan(30);
    for (let i = 0; i < boxes.length; i++) {
      for (let j = 0; j < i; j++) {
        const [a, b] = [boxes[i] as number[], boxes[j] as number[]];
        const hit =
          (a[0] as number) < (b[2] as number) - 0.01 &&
          (b[0] as number) < (a[2] as number) - 0.01 &&
          (a[1] as number) < (b[3] as number) - 0.01 &&
          (b[1] as number) < (a[3] as number) - 0.01;
        expect(hit).toBe(false);
      }
    }
  });
});

describe('14. documentation matches the tool', () => {
  it('the worked example of vectors-and-limits.md prints as shown', async () => {
    const doc = readFileSync(join(ROOT, 'docs/vectors-and-limits.md'), 'utf8');
    const block = /```\nhexsalvage (plan --topology npc --fault a\.outerUpper\.diode --load-angle 30)\n([\s\S]*?)```/.exec(doc);
    expect(block).not.toBeNull();
    const out = (await runInProcess((block?.[1] ?? '').split(' '))).stdout.split('\n');
    for (const line of (block?.[2] ?? '').trim().split('\n')) expect(out).toContain(line);
  });
  it('the committed docs images are what the code draws now (SVG sources, byte for byte)', async () => {
    const { jobs } = (await import(join(ROOT, 'scripts/docs-images.mjs'))) as { jobs: [string, string[], string][] };
    for (const [kind, args, file] of jobs) {
      const out = join(dir, `doc-${file.replace(/\.png$/, '.svg')}`);
      expect((await runInProcess(['plot', kind, ...args, '--out', out])).code).toBe(0);
      expect(readFileSync(out, 'utf8'), file).toBe(readFileSync(join(ROOT, 'docs/images', file.replace(/\.png$/, '.svg')), 'utf8'));
    }
  });
  it('interface.md documents the derating_edge column; --help mentions shorts', async () => {
    expect(readFileSync(join(ROOT, 'docs/interface.md'), 'utf8')).toMatch(/`derating_edge` \(`deratingEdge`\): `begins`/);
    expect((await runInProcess(['--help'])).stdout).toContain('fails open or short');
  });
});

describe('15. the library and a netlist file', () => {
  it('a path given as topology: the message says how to read the file', () => {
    expect(() => planRemedial({ topology: 'examples/five-level-leg.json' })).toThrow(/loadNetlistFile\(path\) from '@hexsalvage\/core\/node'/);
  });
  it('loadNetlistFile gives the same plan as the CLI with the file', async () => {
    const lib = planRemedial({ topology: five, faults: ['a.s1'] });
    const cli = JSON.parse((await runInProcess(['plan', '--topology', join(ROOT, 'examples/five-level-leg.json'), '--fault', 'a.s1', '--json'])).stdout) as {
      mMax: number;
    };
    expect(cli.mMax).toBe(lib.mMax);
  });
  it('loadNetlistFile refuses a bad file with a typed error naming it', () => {
    expect(() => loadNetlistFile(join(ROOT, 'test/fixtures/not-json.json'))).toThrow(/not-json\.json/);
  });
});

describe('16. small glitches', () => {
  it("vectors: phase levels in the leg's notation", async () => {
    const r = await runInProcess(['vectors', '--topology', 'npc', '--fault', 'a.outerUpper', '--polarity', '+--']);
    expect(r.stdout).toContain('Phase levels used: a N, O | b N, O, P | c N, O, P');
  });
  it('waveform plot: the current axis ticks are round numbers', () => {
    for (const peak of [171, 300, 42, 1234]) {
      const sim = simulatePeriod({ topology: 'npc', faults: ['a.outerUpper'], m: 0.4, loadAngleDeg: 20, vdc: 700, currentPeak: peak, f1: 50, fsw: 2000 });
      const svg = waveformsSvg(
        sim,
        simulationWaveform({ topology: 'npc', faults: ['a.outerUpper'], m: 0.4, loadAngleDeg: 20, vdc: 700, currentPeak: peak, f1: 50, fsw: 2000 }),
      );
      const ticks = [...svg.matchAll(/<text x="596" y="[\d.]+" font-size="9">(-?\d+)<\/text>/g)].map((m) => Math.abs(Number(m[1]))).filter((t) => t > 0);
      expect(ticks.length).toBe(4);
      for (const t of ticks) {
        const p = 10 ** Math.floor(Math.log10(t));
        expect([1, 2, 4, 5, 10]).toContain(t / p);
      }
    }
  });
  it('limitingAngleDeg of an exact direction is exact (30, not 29.99999999999999)', () => {
    expect(planRemedial({ topology: 'npc', faults: ['a.outerUpper'], loadAngleDeg: 30 }).limitingAngleDeg).toBe(30);
  });
});

describe('mode spellings stay apart everywhere a fault is named', () => {
  it.each(['open', 'short'] as FaultMode[])('%s', (mode) => {
    const a = analyseLeg({ topology: 'npc', faults: [`a.outerUpper:${mode}`] });
    expect(a.faults.map(formatFault)).toEqual([`a.outerUpper:${mode}`]);
  });
});
