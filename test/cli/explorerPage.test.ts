import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { builtinLeg, planRemedial } from '@hexsalvage/core';
import { describe, expect, it } from 'vitest';
import { commandLineOf, cycleDevice, faultStrings, initialState, partnerOf } from '../../packages/cli/explorer/src/explorerState.js';
import { fromWire, toWire } from '../../packages/cli/explorer/src/explorerProtocol.js';
import { answer } from '../../packages/cli/explorer/src/explorerWorker.js';
import type { ExplorerReply } from '../../packages/cli/explorer/src/explorerProtocol.js';
import { explorerPage } from '../../packages/cli/src/explorer/explorerPage.js';
import { runBin } from '../support/cli.js';

// The explorer's state and its computing side in Node (the page itself is driven in
// explorerBrowser.test.ts): the click cycle, the fault strings the CLI takes, the command line,
// and the worker's answers against planRemedial.
describe('explorer state', () => {
  const npc = builtinLeg('npc');

  it('cycles healthy → open → short → healthy and drops the ambiguity when the element heals', () => {
    let s = initialState('npc');
    s = cycleDevice(s, 'a.outerUpper');
    expect([...s.faults]).toEqual([['a.outerUpper', 'open']]);
    s = { ...s, ambiguous: new Set(['a.outerUpper']) };
    expect(faultStrings(s, npc)).toEqual(['a.outerUpper:open|a.outerUpper.diode:open']);
    s = cycleDevice(s, 'a.outerUpper');
    expect(faultStrings(s, npc)).toEqual(['a.outerUpper:short|a.outerUpper.diode:short']);
    s = cycleDevice(s, 'a.outerUpper');
    expect(s.faults.size).toBe(0);
    expect(s.ambiguous.size).toBe(0);
  });

  it('pairs a switch with its antiparallel diode only (a discrete diode has no partner)', () => {
    expect(partnerOf('b.innerLower', npc)).toBe('b.innerLower.diode');
    expect(partnerOf('b.innerLower.diode', npc)).toBe('b.innerLower');
    expect(partnerOf('c.clampUpper', npc)).toBeNull();
  });

  it('writes the command line a terminal runs, quoting what the shell would split', () => {
    let s = cycleDevice(initialState('npc', undefined, 750), 'a.outerUpper');
    s = { ...s, ambiguous: new Set(['a.outerUpper']), loadAngleDeg: -12.5, levelSteps: 'adjacent', bypass: 'b' };
    expect(commandLineOf('plan', s, npc)).toBe(
      "hexsalvage plan --topology npc --fault 'a.outerUpper:open|a.outerUpper.diode:open' --load-angle -12.5 --polarity-margin 0 --level-steps adjacent --bypass b --vdc 750",
    );
    expect(commandLineOf('report', initialState('file:my leg.json', npc), npc, ['--out', 'r.html'])).toBe(
      "hexsalvage report --topology 'my leg.json' --load-angle 0 --polarity-margin 0 --out r.html",
    );
  });

  it('crosses to the worker and back unchanged', () => {
    const s = { ...cycleDevice(initialState('npc', undefined, 400), 'c.innerUpper'), ambiguous: new Set(['c.innerUpper']) };
    const back = fromWire(JSON.parse(JSON.stringify(toWire(s))));
    expect(back).toEqual(s);
  });
});

describe('explorer worker', () => {
  const run = (state: ReturnType<typeof initialState>, polarity = '') => {
    const replies: ExplorerReply[] = [];
    answer({ kind: 'update', id: 7, state: toWire(state), polarity }, (r) => replies.push(r));
    return replies;
  };

  it('answers the limit first, then the pictures, with the numbers planRemedial gives', () => {
    const s = { ...cycleDevice(initialState('anpc-hybrid'), 'a.innerUpper'), loadAngleDeg: 25 };
    const replies = run(s);
    expect(replies.map((r) => r.kind)).toEqual(['result', 'pictures']);
    const r = replies[0] as Extract<ExplorerReply, { kind: 'result' }>;
    const plan = planRemedial({ topology: 'anpc-hybrid', faults: ['a.innerUpper:open'], loadAngleDeg: 25 });
    expect(r.mMax).toBe(plan.mMax);
    expect(r.faults).toBe('a.innerUpper:open');
    const p = replies[1] as Extract<ExplorerReply, { kind: 'pictures' }>;
    expect(p.polarity).toBe(plan.limitingPolarity);
    expect(p.diagram.startsWith('<svg')).toBe(true);
    expect(p.remedies).toContain('as-is');
  });

  it('answers bad input with the one line the CLI prints, and no result', () => {
    const replies = run({ ...initialState('npc'), polarityMarginDeg: 75 });
    expect(replies).toHaveLength(1);
    const e = replies[0] as Extract<ExplorerReply, { kind: 'error' }>;
    expect(e.kind).toBe('error');
    expect(e.message).not.toContain('\n');
    expect(e.message).toMatch(/polarityMarginDeg/);
  });

  it('gives the plan document the CLI prints for the same command line', () => {
    const s = { ...cycleDevice(initialState('tnpc', undefined, 690), 'b.neutralToOut'), loadAngleDeg: 30 };
    const replies: ExplorerReply[] = [];
    answer({ kind: 'plan-json', id: 1, state: toWire(s) }, (r) => replies.push(r));
    const cli = runBin([...commandLineOf('plan', s, builtinLeg('tnpc')).split(' ').slice(1), '--json']);
    expect(cli.code).toBe(0);
    expect((replies[0] as Extract<ExplorerReply, { kind: 'file' }>).text).toBe(cli.stdout);
  });
});

describe('explorer page file', () => {
  it('keeps any text of a netlist inert inside the page (no way out of its script element)', () => {
    const leg = { ...builtinLeg('two-level'), name: '</script><script>alert(1)</script>\u2028' };
    const html = explorerPage('var x = "</script>"; // <!-- a comment', {
      version: '0',
      topology: 'two-level',
      netlist: leg,
      netlistFile: { name: 'x.json', text: '</script>' },
    });
    expect(html.match(/<\/script>/g)).toHaveLength(2);
    expect(html).not.toContain('<!--');
    expect(html).toContain("default-src 'none'");
  });

  it('writes one self-contained page; bad input is one line and exit 2', () => {
    const dir = mkdtempSync(join(tmpdir(), 'hs-explore-'));
    try {
      const out = join(dir, 'x.html');
      const ok = runBin(['explore', '--topology', 'examples/five-level-leg.json', '--fault', 'a.s1', '--out', out]);
      expect(ok.code).toBe(0);
      const html = readFileSync(out, 'utf8');
      expect(html).toContain('"faults":["a.s1"]');
      // nothing that loads or sends (the SVG namespace URI is a name, not a request)
      expect(html).not.toMatch(/<script[^>]+src=|<link[^>]+href=|<iframe|fetch\(|XMLHttpRequest|WebSocket|sendBeacon|@import/i);
      for (const [argv, pattern] of [
        [['explore'], /--out/],
        [['explore', '--out', join(dir, 'y.txt')], /--out/],
        [['explore', '--topology', 'nope', '--out', out], /topology/],
        [['explore', '--fault', 'a.nothing', '--out', out], /a\.nothing|fault/],
        [['explore', '--fault', 'a.outerUpper|a.outerUpper.diode', '--out', out], /one element per fault/],
      ] as const) {
        const r = runBin([...argv]);
        expect(r.code, argv.join(' ')).toBe(2);
        expect(r.stderr.trim().split('\n'), argv.join(' ')).toHaveLength(1);
        expect(r.stderr).toMatch(pattern);
      }
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
