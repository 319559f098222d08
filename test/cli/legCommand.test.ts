import { describe, expect, it } from 'vitest';
import { analyseLeg, BUILTIN_TOPOLOGIES, builtinLeg, legDocument } from '@hexsalvage/core';
import { expandElements } from '@hexsalvage/core/internal';
import { runBin, runInProcess } from '../support/cli.js';

describe('hexsalvage leg', () => {
  const cases = BUILTIN_TOPOLOGIES.flatMap((t) => [[t, null] as const, ...expandElements(builtinLeg(t)).map((e) => [t, `b.${e.id}`] as const)]);
  it.each(cases)('prints the contract JSON for %s with fault %s', async (t, fault) => {
    const r = await runInProcess(['leg', '--topology', t, ...(fault ? ['--fault', fault] : []), '--json']);
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.stdout);
    expect(doc).toEqual(JSON.parse(JSON.stringify(legDocument(analyseLeg({ topology: t, faults: fault ? [fault] : [] })))));
    expect(doc.topology).toBe(t);
    for (const ph of ['a', 'b', 'c']) {
      expect(Object.keys(doc.phases[ph].patterns)).toEqual(Object.keys(builtinLeg(t).patterns));
      for (const s of ['+', '-', '?']) expect(doc.phases[ph].levels[s]).toEqual([...doc.phases[ph].levels[s]].sort((x: number, y: number) => x - y));
    }
  });

  it('runs from the launcher and reads a netlist file', () => {
    const r = runBin(['leg', '--topology', 'examples/five-level-leg.json', '--fault', 'a.s1', '--json']);
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.stdout);
    expect(doc.topology).toBe('five-level-diode-clamped');
    expect(doc.phases.a.patterns.L4).toEqual({ '+': 0.5, '-': 1 });
  });

  it('prints a readable table with lost levels and interrupted patterns called out', async () => {
    const r = await runInProcess(['leg', '--topology', 'npc', '--fault', 'a.outerUpper.diode']);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('Phase a (faulted)');
    expect(r.stdout).toContain('not used for i<0: current interrupted');
    expect(r.stdout).toMatch(/current in \(-\)\s+N O\s+LOST: P/);
    expect(r.stdout).toContain('Cautions:');
  });

  it('prints the exploration with --explore', async () => {
    const r = await runInProcess(['leg', '--topology', 'anpc', '--explore', '--json']);
    expect(JSON.parse(r.stdout).explore.ok).toBe(true);
  });

  it.each([
    [['leg'], '--topology'],
    [['leg', '--topology', 'npc7'], 'built-in leg'],
    [['leg', '--topology', 'npc', '--fault', 'a.nope'], 'one of outerUpper'],
    [['leg', '--topology', 'npc', '--fault', 'x.outerUpper'], 'one of a, b, c'],
    [['leg', '--topology', 'npc', '--frobnicate'], 'one of --topology'],
    [['leg', '--topology', 'test/fixtures/not-json.json'], 'valid JSON'],
    [['leg', '--topology', 'test/fixtures/bad-key.json'], 'devices[0].kind'],
    [['nonsense'], 'unknown command'],
  ])('exits 2 with one line for %j', (argv, hint) => {
    const r = runBin(argv);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(hint);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).not.toMatch(/\bat .*\.js:\d+/);
  });

  it('answers --help and --version', () => {
    expect(runBin(['--version']).stdout).toMatch(/^hexsalvage \d+\.\d+\.\d+/);
    const h = runBin(['leg', '--help']);
    expect(h.code).toBe(0);
    expect(h.stdout).toContain('Usage: hexsalvage leg');
  });
});
