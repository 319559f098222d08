import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Ajv } from 'ajv';
import { describe, expect, it } from 'vitest';
import { DEMO_DEVICES } from '@hexsalvage/core/internal';
import { ROOT, runBin, runInProcess } from '../support/cli.js';

const dir = mkdtempSync(join(tmpdir(), 'hexsalvage-sim-'));
const base = [
  'simulate',
  '--topology',
  'npc',
  '--fault',
  'a.outerUpper',
  '--m',
  '0.5',
  '--load-angle',
  '20',
  '--polarity-margin',
  '5',
  '--vdc',
  '750',
  '--current-peak',
  '150',
  '--f1',
  '50',
  '--fsw',
  '3000',
];

describe('hexsalvage simulate', () => {
  it('prints the contract JSON: volts, amperes, watts, healthy beside', async () => {
    const r = await runInProcess([...base, '--capacitance', '0.0022', '--json']);
    expect(r.code).toBe(0);
    const d = JSON.parse(r.stdout);
    expect(Object.keys(d.lineVoltage)).toEqual(expect.arrayContaining(['fundamentalPeak', 'thd', 'wthd', 'harmonics']));
    expect(d.lineVoltage.harmonics.length).toBeGreaterThanOrEqual(4 * 60);
    expect(d.lineVoltage.fundamentalPeak).toBeCloseTo(0.5 * 375 * Math.sqrt(3), -1);
    // full spectrum: the RMS less the fundamental's (contract, Version 3), at least what the listed harmonics give
    const v1rms = d.lineVoltage.fundamentalPeak / Math.SQRT2;
    expect(d.lineVoltage.thd).toBeCloseTo(Math.sqrt(d.lineVoltage.rms ** 2 - v1rms ** 2) / v1rms, 12);
    const listed = Math.sqrt(d.lineVoltage.harmonics.slice(1).reduce((k: number, [, v]: number[]) => k + v! * v!, 0)) / d.lineVoltage.fundamentalPeak;
    expect(d.lineVoltage.thd).toBeGreaterThanOrEqual(listed * (1 - 1e-9));
    expect(Object.keys(d.devices['a.outerUpper'])).toEqual(expect.arrayContaining(['avgCurrent', 'rmsCurrent', 'conductionLoss', 'switchingLoss']));
    expect(d.midpoint.ripplePkPk).toBeGreaterThan(0);
    expect(Object.keys(d.healthy)).toEqual(expect.arrayContaining(['lineVoltage', 'devices', 'midpoint']));
  });

  it('writes text, device CSV and a waveform CSV with one row per piece', async () => {
    const wave = join(dir, 'wave.csv');
    const t = await runInProcess([...base, '--waveforms', wave]);
    expect(t.code).toBe(0);
    expect(t.stdout).toContain('Line voltage a-b:');
    expect(t.stdout).toContain('Current derating');
    expect(t.stdout).toContain('invented values');
    expect(t.stdout).toContain('Cautions:');
    const rows = readFileSync(wave, 'utf8').trim().split('\n');
    expect(rows[0]).toBe('time_s,va_v,vb_v,vc_v,vab_v,vbc_v,vca_v,ia_a,ib_a,ic_a,vmid_v');
    expect(rows.length).toBeGreaterThan(60 * 3);
    const csv = (await runInProcess([...base, '--csv'])).stdout.trim().split('\n');
    expect(csv[0]).toMatch(/^element,avg_current_a/);
    expect(csv).toHaveLength(1 + 30);
  });

  it('reads a device file (the shipped demo file validates against the schema, ajv npm) and refuses bad input with one line', () => {
    const schema = JSON.parse(readFileSync(join(ROOT, 'docs', 'schema', 'devices.schema.json'), 'utf8'));
    const demo = JSON.parse(readFileSync(join(ROOT, 'examples', 'demo-devices.json'), 'utf8'));
    const validate = new Ajv({ strict: false }).compile(schema);
    expect(validate(demo), JSON.stringify(validate.errors)).toBe(true);
    expect({ name: demo.name, devices: demo.devices }).toEqual(JSON.parse(JSON.stringify(DEMO_DEVICES)));
    expect(runBin([...base, '--devices', 'examples/demo-devices.json']).code).toBe(0);
    const bad = join(dir, 'bad.json');
    writeFileSync(bad, JSON.stringify({ name: 'x', devices: { igbt: { switch: { eOn: -1, eOff: 0, vRef: 1, iRef: 1 } } } }));
    const cases: [string[], string][] = [
      [[...base, '--devices', bad], 'devices.igbt.switch.eOn'],
      [[...base.slice(0, 5), '--m', '0.9', ...base.slice(7)], 'mMax'],
      [base.filter((_, i) => i < 17), '--fsw'],
      [[...base, '--csv', '--json'], '--csv'],
    ];
    for (const [argv, key] of cases) {
      const r = runBin(argv);
      expect(r.code, argv.join(' ')).toBe(2);
      expect(r.stderr).toContain(key);
      expect(r.stderr.trim().split('\n')).toHaveLength(1);
    }
  });
});
