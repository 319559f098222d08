import { mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { BUILTIN_TOPOLOGIES, builtinLeg } from '@hexsalvage/core';
import { CSV_COLUMNS, expandElements } from '@hexsalvage/core/internal';
import { runBin, runInProcess } from '../support/cli.js';

describe('hexsalvage table', () => {
  const cases = BUILTIN_TOPOLOGIES.flatMap((t) => [[t, null] as const, ...expandElements(builtinLeg(t)).map((e) => [t, `c.${e.id}`] as const)]);
  it.each(cases)('prints a readable table for %s with fault %s', async (t, fault) => {
    const r = await runInProcess(['table', '--topology', t, ...(fault ? ['--fault', fault] : []), '--polarity', '+-?']);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('Polarity +-? (index');
    expect(r.stdout).toContain('Flags (polarity +-?):');
  });
  it('shows the line-rate flag of a hybrid leg', async () => {
    const r = await runInProcess(['table', '--topology', 'anpc-hybrid', '--fault', 'a.innerUpper']);
    expect(r.stdout).toContain('LINE-RATE DEVICES AT PWM');
    expect(r.stdout).toContain('MIDPOINT CONTROL LOST');
  });
  it('prints the table document with --json', async () => {
    const r = await runInProcess(['table', '--topology', 'tnpc', '--json']);
    const d = JSON.parse(r.stdout);
    expect(d.kind).toBe('hexsalvage-switching-table');
    expect(Object.keys(d.polarities)).toHaveLength(25);
  });
});

describe('hexsalvage export', () => {
  const dir = mkdtempSync(join(tmpdir(), 'hexsalvage-export-'));
  it.each(['json', 'csv', 'c'])('writes %s for every built-in leg', async (format) => {
    for (const t of BUILTIN_TOPOLOGIES) {
      const out = join(dir, `${t}.${format}`);
      const r = await runInProcess(['export', '--format', format, '--out', out, '--topology', t, '--fault', 'b.' + expandElements(builtinLeg(t))[0]!.id]);
      expect(r.code).toBe(0);
      const text = readFileSync(out, 'utf8');
      if (format === 'json') expect(JSON.parse(text).kind).toBe('hexsalvage-export');
      if (format === 'csv') expect(text.split('\n')[0]).toBe(CSV_COLUMNS.join(','));
      if (format === 'c') expect(text).toContain('static inline int hs_locate(');
    }
  });
  it('replaces an existing file atomically and leaves no temporary file', async () => {
    const out = join(dir, 'replace.csv');
    writeFileSync(out, 'old contents');
    const r = await runInProcess(['export', '--format', 'csv', '--out', out, '--topology', 'npc']);
    expect(r.code).toBe(0);
    expect(readFileSync(out, 'utf8').startsWith('polarity_index,')).toBe(true);
    expect(readdirSync(dir).filter((f) => f.endsWith('.tmp'))).toEqual([]);
  });
  it.each([
    [['export', '--format', 'xml', '--out', 'x', '--topology', 'npc'], 'one of json, csv, c'],
    [['export', '--format', 'csv', '--topology', 'npc'], '--out'],
    [['export', '--format', 'csv', '--out', '/proc/version/nope.csv', '--topology', 'npc'], 'is not a folder'],
    [['export', '--format', 'c', '--out', join(tmpdir(), 'x.h'), '--topology', 'npc', '--prefix', 'bad-prefix'], 'C identifier'],
  ])('exits 2 with one line for %j', (argv, hint) => {
    const r = runBin(argv);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(hint);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
  });
});
