import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Ajv } from 'ajv';
import { describe, expect, it } from 'vitest';
import { createModulator, exportC, exportCsv, exportDocument, HexsalvageInputError, planRemedial, POLARITY_STRINGS, switchingTable } from '@hexsalvage/core';
import { CSV_COLUMNS } from '@hexsalvage/core/internal';
import { fc, FC_SEED } from '../support/fc.js';

const SCHEMA = JSON.parse(readFileSync(new URL('../../docs/schema/export.schema.json', import.meta.url), 'utf8'));

describe('exportDocument', () => {
  // ajv (npm): a general-purpose JSON Schema validator checks real output against docs/schema.
  const validate = new Ajv({ allErrors: true, strict: false }).compile(SCHEMA);
  it.each([
    ['npc', ['a.outerUpper']],
    ['anpc-hybrid', ['a.innerUpper', 'b.clampLower.diode']],
    ['tnpc', []],
  ] as const)('validates against the JSON Schema (%s %j)', (topology, faults) => {
    const doc = JSON.parse(
      JSON.stringify(exportDocument(planRemedial({ topology, faults: [...faults], loadAngleDeg: 20 }), switchingTable({ topology, faults: [...faults] }))),
    );
    const ok = validate(doc);
    expect(validate.errors ?? []).toEqual([]);
    expect(ok).toBe(true);
  });
  it('fails validation when a key is broken (the schema can fail)', () => {
    const doc = JSON.parse(JSON.stringify(exportDocument(planRemedial({ topology: 'npc' }), switchingTable({ topology: 'npc' }))));
    doc.plan.limitingPolarity = '+++x';
    expect(validate(doc)).toBe(false);
  });
});

describe('exportCsv', () => {
  it('has the documented header and one row per polarity × triangle × vertex', () => {
    const t = switchingTable({ topology: 'npc', faults: ['a.outerUpper'] });
    const lines = exportCsv(t).trimEnd().split('\n');
    expect(lines[0]).toBe(CSV_COLUMNS.join(','));
    const expected = POLARITY_STRINGS.reduce((n, p) => n + 3 * t.polarities[p]!.tableTriangles.length, 0);
    expect(lines).toHaveLength(expected + 1);
    for (const l of lines.slice(1)) expect(l.split(',')).toHaveLength(CSV_COLUMNS.length);
  });
});

// A C program that reads "p alpha beta" lines and prints, per reference, the triangle (within its
// polarity), the three dwell times, the clamp flag, the polarity index of +-?, and the nine gate
// masks of each vertex's first realisation.
const DRIVER_C = `#include <stdio.h>
#include "pump_table.h"
int main(void) {
  int p, clamped, t, v, k; double a, b, d[3];
  while (scanf("%d %lf %lf", &p, &a, &b) == 3) {
    t = pump_locate(p, a, b, d, &clamped);
    if (t < 0) { printf("-1\\n"); continue; }
    printf("%d %.17g %.17g %.17g %d %d", t - pump_tri_first[p], d[0], d[1], d[2], clamped, pump_polarity_index(1, -1, 0));
    for (v = 0; v < 3; v++) for (k = 0; k < 3; k++) printf(" %lu", (unsigned long)pump_real_mask[pump_real_first[3 * t + v]][k]);
    printf("\\n");
  }
  return 0;
}
`;

// The gate masks the TypeScript table gives for the states of a triangle: vertex by vertex, phase
// by phase, bit i = gated device i (table.devices), from each state's pattern.
function expectedMasks(table: ReturnType<typeof switchingTable>, p: number, t: number): number[] {
  const tri = table.polarities[POLARITY_STRINGS[p]!]!.tableTriangles[t]!;
  return tri.vertices.flatMap((v) => {
    const phases = v.realisations[0]!.phases;
    return phases.map((s) => table.patternGates[table.patterns.indexOf(s.pattern)]!.reduce((m, g) => m + 2 ** table.devices.indexOf(g), 0));
  });
}

describe('exportC', () => {
  it('rejects a prefix that is not a C identifier', () => {
    expect(() => exportC(switchingTable({ topology: 'npc' }), { prefix: '9x' })).toThrow(HexsalvageInputError);
  });

  const cc = ['cc', 'gcc', 'clang'].find((c) => spawnSync(c, ['--version']).status === 0);
  it.skipIf(!cc)('compiles in a program that includes it and calls nothing, or one helper, with -Wall -Wextra -Werror', () => {
    const dir = mkdtempSync(join(tmpdir(), 'hexsalvage-c-'));
    writeFileSync(join(dir, 'hs_table.h'), exportC(switchingTable({ topology: 'npc', faults: ['a.clampUpper'] })));
    writeFileSync(join(dir, 'none.c'), '#include "hs_table.h"\nint main(void) { return 0; }\n');
    writeFileSync(join(dir, 'one.c'), '#include "hs_table.h"\nint main(void) { return hs_polarity_index(1, -1, 0) == 4 ? 0 : 1; }\n');
    for (const f of ['none', 'one']) {
      execFileSync(cc as string, ['-std=c99', '-Wall', '-Wextra', '-Werror', '-o', join(dir, f), join(dir, `${f}.c`), '-lm']);
      expect(spawnSync(join(dir, f)).status).toBe(0);
    }
  });

  it.skipIf(!cc)('escapes awkward leg and pattern names so the header still compiles', () => {
    const leg = {
      name: 'odd */ names??',
      dcNodes: { 'DC+': 1, 'DC-': -1 },
      output: 'phase out',
      devices: [
        { id: 'T1', kind: 'igbt', from: 'DC+', to: 'phase out', antiparallelDiode: true },
        { id: 'T2', kind: 'igbt', from: 'phase out', to: 'DC-', antiparallelDiode: true },
      ],
      patterns: { 'hi "q" ü?': ['T1'], lo: ['T2'] },
    };
    const header = exportC(switchingTable({ topology: leg }));
    expect(header).toContain('"hi \\"q\\" \\303\\274\\?"');
    const dir = mkdtempSync(join(tmpdir(), 'hexsalvage-c-odd-'));
    writeFileSync(join(dir, 'hs_table.h'), header);
    writeFileSync(join(dir, 'main.c'), '#include "hs_table.h"\nint main(void) { return hs_pattern_names[0][0] == 104 ? 0 : 1; }\n');
    execFileSync(cc as string, ['-std=c99', '-Wall', '-Werror', '-Wno-unused-function', '-o', join(dir, 'main'), join(dir, 'main.c'), '-lm']);
    expect(spawnSync(join(dir, 'main')).status).toBe(0);
  });
  it.skipIf(!cc)('float tables: same triangle and gate masks, dwell within 1e-6 (references clear of triangle edges)', () => {
    const table = switchingTable({ topology: 'npc', faults: ['a.outerUpper'] });
    const dir = mkdtempSync(join(tmpdir(), 'hexsalvage-cf-'));
    const header = exportC(table, { prefix: 'pump', cType: 'float' });
    expect(header).toContain('typedef float pump_real;');
    writeFileSync(join(dir, 'pump_table.h'), header);
    writeFileSync(join(dir, 'driver.c'), DRIVER_C);
    execFileSync(cc as string, [
      '-std=c99',
      '-O2',
      '-Wall',
      '-Wextra',
      '-Werror',
      '-Wno-unused-function',
      '-o',
      join(dir, 'driver'),
      join(dir, 'driver.c'),
      '-lm',
    ]);
    const mod = createModulator(table);
    const buf = new Float64Array(4);
    // references inside each polarity's reach, in every direction
    // (integers, not fc.double, whose bias to tiny values would put most points at the origin vertex)
    const cases = fc
      .sample(fc.tuple(fc.nat(24), fc.integer({ min: 1, max: 970 }), fc.integer({ min: 0, max: 359999 })), { seed: FC_SEED, numRuns: 3000 })
      .map(([p, f, deg]) => {
        const r = (f / 1000) * table.polarities[POLARITY_STRINGS[p]!]!.reach;
        const th = (deg / 1000) * (Math.PI / 180);
        return [p, r * Math.cos(th), r * Math.sin(th)] as [number, number, number];
      })
      .filter(([p, a, b]) => mod.modulateInto(a, b, p, buf) >= 0 && buf[3] === 0 && Math.min(buf[0]!, buf[1]!, buf[2]!) > 1e-4);
    expect(cases.length).toBeGreaterThan(1000);
    const out = execFileSync(join(dir, 'driver'), { input: cases.map(([p, a, b]) => `${p} ${a.toPrecision(17)} ${b.toPrecision(17)}`).join('\n') })
      .toString()
      .trim()
      .split('\n');
    cases.forEach(([p, a, b], i) => {
      const t = mod.modulateInto(a, b, p, buf);
      const line = (out[i] as string).split(' ');
      expect(Number(line[0])).toBe(t);
      for (let k = 0; k < 3; k++) expect(Math.abs(Number(line[k + 1]) - (buf[k] as number))).toBeLessThan(1e-6);
      expect(line.slice(6).map(Number)).toEqual(expectedMasks(table, p, t));
    });
  });

  it('names the guard and include after the file, lists the devices of the masks, defines the limits, rules and Vdc, and lists every realisation', () => {
    const table = switchingTable({ topology: 'npc', faults: ['a.outerUpper'] });
    const plan = planRemedial({ topology: 'npc', faults: ['a.outerUpper'], loadAngleDeg: 20, polarityMarginDeg: 2 });
    const h = exportC(table, { prefix: 'drv', fileName: 'build/remedial-table.h', limits: plan, vdc: 750 });
    expect(h).toContain('#ifndef REMEDIAL_TABLE_H_');
    expect(h).toContain('#include "remedial-table.h"');
    expect(h).toContain('bit i is gated device i of the phase: 0 outerUpper, 1 innerUpper, 2 innerLower, 3 outerLower');
    expect(h).toContain('static const uint32_t drv_pattern_mask[DRV_PATTERN_COUNT] = {0x3UL, 0x6UL, 0xCUL};');
    expect(h).toMatch(/#define DRV_M_MAX 0\.5773502691896257\d/);
    expect(h).toContain('#define DRV_LOAD_ANGLE_DEG 20.0');
    expect(h).toContain('#define DRV_POLARITY_MARGIN_DEG 2.0');
    expect(h).toContain('#define DRV_RULE_LEVEL_STEPS "commutable"');
    expect(h).toContain('#define DRV_VDC 750.0');
    const total = Object.values(table.polarities).reduce(
      (n, p) => n + p.tableTriangles.reduce((k, t) => k + t.vertices.reduce((j, v) => j + v.realisations.length, 0), 0),
      0,
    );
    expect(h).toContain(`#define DRV_REALISATION_COUNT ${total}`);
    // a small vector of the healthy polarities has a P-type and an N-type realisation with opposite midpoint signs
    const signs = h
      .match(/drv_real_midpoint_sign\[\d+\] = \{([^}]*)\}/)![1]!
      .split(', ')
      .map(Number);
    expect(signs).toContain(1);
    expect(signs).toContain(-1);
    expect(() => exportC(table, { cType: 'half' as never })).toThrow(HexsalvageInputError);
  });

  // the second and third cases have admissible tilings that do not fill their hulls, so references
  // outside are clamped to the tiling's outline (Version 2) in both languages
  it.skipIf(!cc).each([
    ['anpc-hybrid', ['a.innerUpper', 'c.clampLower'], 'commutable'],
    ['npc', ['a.clampUpper'], 'commutable'],
    ['tnpc', ['a.neutralToOut'], 'adjacent'],
  ] as const)('compiles with the machine C compiler and matches the TypeScript modulator on every polarity (%s %j %s)', (topology, faults, levelSteps) => {
    const table = switchingTable({ topology, faults: [...faults], levelSteps });
    if (topology !== 'anpc-hybrid') expect(Object.values(table.polarities).some((p) => p.outline !== null)).toBe(true);
    const dir = mkdtempSync(join(tmpdir(), 'hexsalvage-c-'));
    writeFileSync(join(dir, 'pump_table.h'), exportC(table, { prefix: 'pump' }));
    writeFileSync(join(dir, 'driver.c'), DRIVER_C);
    execFileSync(cc as string, [
      '-std=c99',
      '-O2',
      '-ffp-contract=off',
      '-Wall',
      '-Werror',
      '-Wno-unused-function',
      '-o',
      join(dir, 'driver'),
      join(dir, 'driver.c'),
      '-lm',
    ]);
    const mod = createModulator(table);
    const rnd = fc.sample(fc.tuple(fc.nat(24), fc.double({ min: -1.6, max: 1.6, noNaN: true }), fc.double({ min: -1.6, max: 1.6, noNaN: true })), {
      seed: FC_SEED,
      numRuns: 3000,
    });
    const cases = [...POLARITY_STRINGS.map((_, p) => [p, 0.1, 0.05] as [number, number, number]), ...rnd];
    const out = execFileSync(join(dir, 'driver'), { input: cases.map(([p, a, b]) => `${p} ${a.toPrecision(17)} ${b.toPrecision(17)}`).join('\n') })
      .toString()
      .trim()
      .split('\n');
    const buf = new Float64Array(4);
    cases.forEach(([p, a, b], i) => {
      const t = mod.modulateInto(a, b, p, buf);
      const line = (out[i] as string).split(' ');
      expect(Number(line[0])).toBe(t);
      if (t < 0) return;
      for (let k = 0; k < 3; k++) expect(Number(line[k + 1])).toBeCloseTo(buf[k] as number, 12);
      expect(Number(line[4])).toBe(buf[3]);
      expect(Number(line[5])).toBe(POLARITY_STRINGS.indexOf('+-?'));
      expect(line.slice(6).map(Number)).toEqual(expectedMasks(table, p, t));
    });
  });
});
