import { spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Ajv } from 'ajv';
import { describe, expect, it } from 'vitest';
import { evaluateClaim, lineRmsVolts, modulationOfLineRms, phasePeakVolts, planRemedial } from '@hexsalvage/core';
import { buildDate, commandLine } from '../../packages/cli/src/commandLine.js';
import { readScenario } from '../../packages/cli/src/inputs/readScenario.js';
import { ROOT, runBin, runInProcess } from '../support/cli.js';

const dir = mkdtempSync(join(tmpdir(), 'hexsalvage-volts-'));
const S = join(ROOT, 'examples', 'pump-scenario.json');

describe('physical units (--vdc)', () => {
  it('converts by the contract formulas (common practice: line RMS = phase peak × √3 / √2)', () => {
    expect(phasePeakVolts(1, 750)).toBe(375);
    expect(lineRmsVolts(2 / Math.sqrt(3), 750)).toBeCloseTo(530.330086, 5);
    // a 400 V line-to-line RMS motor on a 750 V link needs m = 400 / (375 · √1.5)
    expect(modulationOfLineRms(400, 750)).toBeCloseTo(400 / (375 * Math.sqrt(1.5)), 14);
    for (const m of [0, 0.3, 1.1]) expect(modulationOfLineRms(lineRmsVolts(m, 690), 690)).toBeCloseTo(m, 14);
  });

  it('plan --vdc adds the contract "volts" block and volts in text', async () => {
    const j = await runInProcess(['plan', '--topology', 'npc', '--fault', 'a.outerUpper', '--vdc', '750', '--json']);
    const plan = JSON.parse(j.stdout);
    expect(plan.volts).toEqual({
      vdc: 750,
      phasePeakMax: (plan.mMax * 750) / 2,
      lineRmsMax: plan.mMax * 375 * Math.sqrt(1.5),
      phasePeakMaxHealthy: (plan.mMaxHealthy * 750) / 2,
      lineRmsMaxHealthy: plan.mMaxHealthy * 375 * Math.sqrt(1.5),
    });
    expect(planRemedial({ topology: 'npc', faults: ['a.outerUpper'], vdc: 750 }).volts).toEqual(plan.volts);
    const t = await runInProcess(['plan', '--topology', 'npc', '--fault', 'a.outerUpper', '--vdc', '750']);
    expect(t.stdout).toContain('0.577350 = 265.2 V line-to-line RMS (216.5 V phase peak)');
    expect((await runInProcess(['plan', '--topology', 'npc'])).stdout).not.toContain(' V line-to-line');
    expect(runBin(['plan', '--topology', 'npc', '--vdc', '-5']).code).toBe(2);
  });

  it('sweep, table and cycle show volts', async () => {
    const csv = (await runInProcess(['sweep', '--topology', 'npc', '--fault', 'a.outerUpper', '--step', '90', '--vdc', '800', '--csv'])).stdout
      .trim()
      .split('\n');
    expect(csv[0]).toMatch(/,phase_peak_max_v,line_rms_max_v$/);
    const [, mMax, , , , , , , pk, rms] = csv[1]!.split(',');
    expect(Number(pk)).toBeCloseTo(Number(mMax) * 400, 2);
    expect(Number(rms)).toBeCloseTo(Number(mMax) * 400 * Math.sqrt(1.5), 2);
    expect((await runInProcess(['table', '--topology', 'npc', '--polarity', '+--', '--vdc', '800'])).stdout).toContain('P = 400.0 V');
    expect((await runInProcess(['cycle', '--topology', 'npc', '--m', '0.5', '--vdc', '800'])).stdout).toContain(
      'At Vdc = 800.0 V: m = 244.9 V line-to-line RMS',
    );
  });

  it('claims may promise line-to-line RMS volts instead of m', () => {
    const byVolts = evaluateClaim({ name: 'v', topology: 'npc', faults: ['a.outerUpper'], vdc: 750, lineRmsV: 250, loadAngleDeg: [0, 30] });
    expect(byVolts.m).toBeCloseTo(250 / (375 * Math.sqrt(1.5)), 14);
    expect(byVolts.holds).toBe(true);
    expect(byVolts.volts?.lineRmsPromised).toBeCloseTo(250, 9);
    const file = join(dir, 'claims.json');
    writeFileSync(
      file,
      JSON.stringify({ claims: [{ name: 'too much', topology: 'npc', faults: ['a.outerUpper'], vdc: 750, lineRmsV: 300, loadAngleDeg: [0, 30] }] }),
    );
    const r = runBin(['check', file]);
    expect(r.code).toBe(1);
    expect(r.stdout).toContain('300.0 / 265.2 V (Vdc 750 V)');
    writeFileSync(file, JSON.stringify({ claims: [{ name: 'both', topology: 'npc', faults: [], m: 0.5, vdc: 750, lineRmsV: 300, loadAngleDeg: [0, 30] }] }));
    expect(runBin(['check', file]).stderr).toContain('either "m" or "lineRmsV"');
    writeFileSync(file, JSON.stringify({ claims: [{ name: 'no link', topology: 'npc', faults: [], lineRmsV: 300, loadAngleDeg: [0, 30] }] }));
    expect(runBin(['check', file]).stderr).toContain('claims[0].vdc');
  });
});

describe('scenario file and the review report', () => {
  it('the demo scenario validates against docs/schema/scenario.schema.json (ajv, npm)', () => {
    const schema = JSON.parse(readFileSync(join(ROOT, 'docs', 'schema', 'scenario.schema.json'), 'utf8'));
    const validate = new Ajv({ allErrors: true, strict: false }).compile(schema);
    expect(validate(JSON.parse(readFileSync(S, 'utf8'))), JSON.stringify(validate.errors)).toBe(true);
    expect(
      validate({ drive: 'x', vdc: 700, topology: 'npc', claims: [{ name: 'a', topology: 'npc', faults: [], m: 1, lineRmsV: 2, loadAngleDeg: [0, 1] }] }),
    ).toBe(false);
    const sc = readScenario(S);
    expect(sc.vdc).toBe(750);
    expect(sc.loadAngleDeg).toBe(25);
    expect(sc.claims).toHaveLength(3);
  });

  it('refuses a bad scenario with one line naming the key', () => {
    const cases: [object, string][] = [
      [{ drive: 'x', vdc: 750, topology: 'npc', speed: 3 }, 'speed'],
      [{ drive: '', vdc: 750, topology: 'npc' }, 'drive'],
      [{ drive: 'x', vdc: 0, topology: 'npc' }, 'vdc'],
      [{ drive: 'x', vdc: 750, topology: 'npc', loadAngleRangeDeg: [10, 40], loadAngleDeg: 50 }, 'loadAngleDeg'],
      [{ drive: 'x', vdc: 750, topology: 'no-such-leg' }, 'topology'],
      [{ drive: 'x', vdc: 750, topology: 'npc', claims: [], claimsFile: 'a.json' }, 'claims'],
    ];
    for (const [doc, key] of cases) {
      const f = join(dir, 'bad.json');
      writeFileSync(f, JSON.stringify(doc));
      const r = runBin(['report', '--scenario', f, '--out', join(dir, 'r.html')]);
      expect(r.code, key).toBe(2);
      expect(r.stderr).toContain(key);
      expect(r.stderr.trim().split('\n')).toHaveLength(1);
    }
    expect(runBin(['report', '--scenario', S, '--fault', 'a.outerUpper', '--out', join(dir, 'r.html')]).stderr).toContain('not together with --scenario');
  });

  it('report --scenario: header with the drive data, command line, version, date and input hashes; claims with their case; a sign-off block; byte-reproducible', () => {
    const out = join(dir, 'pump.html');
    const env = { ...process.env, SOURCE_DATE_EPOCH: '1796169600' };
    const run = () =>
      spawnSync(process.execPath, [join(ROOT, 'packages/cli/bin/hexsalvage.mjs'), 'report', '--scenario', 'examples/pump-scenario.json', '--out', out], {
        cwd: ROOT,
        env,
        encoding: 'utf8',
      });
    expect(run().status).toBe(0);
    const html = readFileSync(out, 'utf8');
    expect(run().status).toBe(0);
    expect(readFileSync(out, 'utf8')).toBe(html);
    const sha = (p: string) =>
      createHash('sha256')
        .update(readFileSync(join(ROOT, p)))
        .digest('hex');
    expect(html).toContain('Circulation pump CP-2');
    expect(html).toContain('90.0 kW');
    expect(html).toContain('750.0 V (Vdc/2 = 375.0 V)');
    expect(html).toContain('hexsalvage report --scenario examples/pump-scenario.json --out ');
    expect(html).toContain('2026-12-02T00:00:00Z');
    for (const p of ['examples/pump-scenario.json', 'examples/pump-claims.json', 'examples/five-level-leg.json']) expect(html).toContain(`SHA-256 ${sha(p)}`);
    expect(html).toContain('another case than this report');
    expect(html).toContain('Sign-off');
    expect(html).toContain('reviewed by');
    expect(html).toMatch(/0\.[0-9]+<\/strong> = [0-9.]+ V line-to-line RMS/);
    // the scenario gives the drive's data, so the report simulates the operating point
    expect(html).toContain('9. What degraded operation costs');
    expect(html).toContain('Current derating:');
    expect(html).toContain('Line-voltage spectrum');
  });

  it('commandLine quotes what a shell would split, and buildDate follows SOURCE_DATE_EPOCH', () => {
    const args = {
      positionals: [],
      flags: new Set(['atlas']),
      values: new Map<string, string | number>([
        ['out', 'my report.html'],
        ['load-angle', 25],
      ]),
      lists: new Map([['fault', ['a.x:open']]]),
    };
    const specs = [
      { name: 'fault', type: 'list' as const, help: '' },
      { name: 'load-angle', type: 'number' as const, help: '' },
      { name: 'atlas', type: 'flag' as const, help: '' },
      { name: 'out', type: 'string' as const, help: '' },
    ];
    expect(commandLine('report', specs, args)).toBe("hexsalvage report --fault a.x:open --load-angle 25 --atlas --out 'my report.html'");
    expect(buildDate({ SOURCE_DATE_EPOCH: '0' })).toBe('1970-01-01T00:00:00Z');
    expect(buildDate({})).toMatch(/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\dZ$/);
  });
});
