import { existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { builtinLeg, faultAtlas } from '@hexsalvage/core';
import { progressLine } from '../../packages/cli/src/output/progressLine.js';
import { runBin, runInProcess } from '../support/cli.js';

const dir = mkdtempSync(join(tmpdir(), 'hexsalvage-atlas-'));

describe('hexsalvage atlas', () => {
  it('prints the contract JSON, equal to the library document', async () => {
    const r = await runInProcess(['atlas', '--topology', 'npc', '--modes', 'open', '--load-angle-range', '-30,40', '--step', '10', '--json']);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
    const d = JSON.parse(r.stdout);
    expect(d).toEqual(JSON.parse(JSON.stringify(faultAtlas({ topology: 'npc', modes: ['open'], loadAngleRangeDeg: [-30, 40], stepDeg: 10 }))));
    expect(d.topology).toBe('npc');
    for (const e of d.entries) {
      expect(Object.keys(e)).toEqual(expect.arrayContaining(['faults', 'mMaxMin', 'worstLoadAngleDeg', 'mMaxAt', 'verdict']));
      expect(['full', 'derated', 'cannot-run']).toContain(e.verdict);
      expect(e.mMaxAt.map((p: number[]) => p[0])).toEqual([-30, -20, -10, 0, 10, 20, 30, 40]);
    }
  });

  it('gives byte-identical JSON for --jobs 1, 2 and 4 (worker threads), pairs included', () => {
    const base = ['atlas', '--topology', 'anpc', '--modes', 'open', '--pairs', '--step', '15', '--json'];
    const one = runBin([...base, '--jobs', '1']);
    expect(one.code).toBe(0);
    const two = runBin([...base, '--jobs', '2']);
    const four = runBin([...base, '--jobs', '4', '--force-jobs']);
    expect(two.stdout).toBe(one.stdout);
    expect(four.stdout).toBe(one.stdout);
    // not a terminal: nothing on stderr
    expect(four.stderr).toBe('');
    expect(JSON.parse(one.stdout).entries).toHaveLength((36 * 35) / 2);
  });

  it('works on a netlist file, writes text, CSV and --out atomically', async () => {
    const leg = join(dir, 'leg.json');
    writeFileSync(leg, JSON.stringify({ ...builtinLeg('tnpc'), name: 'test T-type' }));
    const txt = await runInProcess(['atlas', '--topology', leg, '--vdc', '800']);
    expect(txt.code).toBe(0);
    expect(txt.stdout).toContain('Fault atlas of test T-type');
    expect(txt.stdout).toMatch(/CANNOT RUN|derated|full voltage/);
    expect(txt.stdout).toContain('line V rms');
    expect(txt.stdout).toContain('Cautions:');
    const csvFile = join(dir, 'atlas.csv');
    const csv = await runInProcess(['atlas', '--topology', 'npc', '--csv', '--step', '45', '--out', csvFile]);
    expect(csv.code).toBe(0);
    expect(csv.stdout).toMatch(/^wrote .*atlas\.csv \(20 fault sets/);
    const lines = readFileSync(csvFile, 'utf8').trim().split('\n');
    expect(lines[0]).toBe(
      'faults,verdict,m_max_min,derating_ratio,worst_load_angle_deg,m_max_hull_min,best_remedy,best_remedy_m_max_min,reason,m_max_at_-90,m_max_at_-45,m_max_at_0,m_max_at_45,m_max_at_90',
    );
    expect(lines).toHaveLength(21);
    expect(readdirSync(dir).filter((f) => f.endsWith('.tmp'))).toEqual([]);
  });

  it('refuses bad input with one line and exit 2', () => {
    const cases: [string[], string][] = [
      [['atlas'], '--topology'],
      [['atlas', '--topology', 'npc', '--modes', 'open,melted'], '--modes'],
      [['atlas', '--topology', 'npc', '--load-angle-range', '10'], '--load-angle-range'],
      [['atlas', '--topology', 'npc', '--load-angle-range', '20,-20'], '--load-angle-range'],
      [['atlas', '--topology', 'npc', '--load-angle-range', '0x10,20'], '--load-angle-range'],
      [['atlas', '--topology', 'npc', '--jobs', '0'], '--jobs'],
      [['atlas', '--topology', 'npc', '--jobs', '1.5'], '--jobs'],
      [['atlas', '--topology', 'npc', '--csv', '--json'], '--csv'],
      [['atlas', '--topology', 'npc', '--step', '0.0001'], 'stepDeg'],
      [['atlas', '--topology', 'npc', '--out', join(dir, 'missing', 'x.json')], '--out'],
    ];
    for (const [argv, key] of cases) {
      const r = runBin(argv);
      expect(r.code, argv.join(' ')).toBe(2);
      expect(r.stderr).toContain(key);
      expect(r.stderr.trim().split('\n')).toHaveLength(1);
    }
    expect(existsSync(join(dir, 'missing'))).toBe(false);
  });
});

describe('plot atlas and report --atlas', () => {
  it('draws the heat map and the pair matrix, and refuses --fault', async () => {
    const svg = join(dir, 'atlas.svg');
    const r = await runInProcess(['plot', 'atlas', '--topology', 'anpc-hybrid', '--step', '10', '--out', svg]);
    expect(r.code).toBe(0);
    expect(readFileSync(svg, 'utf8')).toContain('Fault atlas: anpc-hybrid');
    const pairs = join(dir, 'pairs.svg');
    expect((await runInProcess(['plot', 'atlas', '--topology', 'two-level', '--pairs', '--out', pairs])).code).toBe(0);
    expect(readFileSync(pairs, 'utf8')).toContain('Fault pairs: two-level');
    const bad = await runInProcess(['plot', 'atlas', '--topology', 'npc', '--fault', 'a.outerUpper', '--out', svg]);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toContain('--fault');
  });

  it('adds the atlas appendix to the report, and refuses atlas options without --atlas', async () => {
    const html = join(dir, 'review.html');
    const r = await runInProcess(['report', '--topology', 'npc', '--fault', 'a.innerUpper', '--atlas', '--modes', 'open', '--out', html]);
    expect(r.code).toBe(0);
    const text = readFileSync(html, 'utf8');
    expect(text).toContain('Appendix: every single fault of this leg (fault atlas)');
    expect(text).toContain('a.outerUpper:open');
    expect(text).toContain('CANNOT RUN');
    const bad = await runInProcess(['report', '--topology', 'npc', '--modes', 'open', '--out', html]);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toContain('only together with --atlas');
  });
});

describe('progressLine', () => {
  it('draws on a terminal only, in place, and erases itself at the end', () => {
    let tty = '';
    const p = progressLine(
      {
        stdout: async () => {},
        stderr: (t) => {
          tty += t;
        },
        stderrIsTTY: true,
      },
      'fault classes',
    );
    p.update(3, 3);
    p.end();
    // the terminal's escape character written as <ESC> so that the pattern reads as text
    expect(tty.replaceAll('\u001b', '<ESC>')).toMatch(/^\r<ESC>\[2K3\/3 fault classes, [\d.]+\/s(, about 0 s left)?\r<ESC>\[2K$/);
    let pipe = '';
    const q = progressLine(
      {
        stdout: async () => {},
        stderr: (t) => {
          pipe += t;
        },
      },
      'fault classes',
    );
    q.update(1, 2);
    q.end();
    expect(pipe).toBe('');
    let json = '';
    const j = progressLine(
      {
        stdout: async () => {},
        stderr: (t) => {
          json += t;
        },
        stderrIsTTY: true,
      },
      'fault classes',
      false,
    );
    j.update(1, 2);
    j.end();
    expect(json).toBe('');
  });
});
