import { execFileSync, spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { builtinLeg, createModulator, deratingCurve, exportC, exportCsv, HexsalvageInputError, planRemedial, switchingTable } from '@hexsalvage/core';
import { csvCell, legTable, NETLIST_LIMITS } from '@hexsalvage/core/internal';
import { BIN, ROOT, runBin, runInProcess } from '../support/cli.js';

// The second hostile review: each class of failure with the input that showed it, and variants.
const dir = mkdtempSync(join(tmpdir(), 'hexsalvage-hard2-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const write = (name: string, text: string) => {
  const p = join(dir, name);
  writeFileSync(p, text);
  return p;
};
const oneLine = (r: { code: number; stderr: string }, code = 2) => {
  expect(r.code).toBe(code);
  expect(r.stderr.trim().split('\n')).toHaveLength(1);
};
const twoLevel = (over: Record<string, unknown> = {}) => ({
  name: 'two',
  dcNodes: { P: 1, N: -1 },
  output: 'out',
  devices: [
    { id: 'T1', kind: 'igbt', from: 'P', to: 'out', antiparallelDiode: true, rating: 2 },
    { id: 'T2', kind: 'igbt', from: 'out', to: 'N', antiparallelDiode: true, rating: 2 },
  ],
  patterns: { P: ['T1'], N: ['T2'] },
  ...over,
});
const tmpLeft = (d: string) => readdirSync(d).filter((f) => f.endsWith('.tmp'));

describe('1. a full disk: a file is written whole or not at all', () => {
  // a file-size limit (ulimit -f, SIGXFSZ ignored) makes the write fail part-way, as a full disk does
  it.each([
    [['export', '--format', 'json', '--topology', 'npc', '--fault', 'a.outerUpper']],
    [['report', '--topology', 'npc']],
    [['atlas', '--topology', 'npc', '--csv']],
  ])('%j: exit 74, one line, the old file untouched, no temporary file', (argv) => {
    const sub = mkdtempSync(join(dir, 'full-'));
    const target = join(sub, argv[0] === 'report' ? 'r.html' : 'out.txt');
    writeFileSync(target, 'old contents\n');
    const cmd = `trap '' XFSZ; ulimit -f 4; exec "${process.execPath}" "${BIN}" ${argv.map((a) => `'${a}'`).join(' ')} --out '${target}'`;
    const r = spawnSync('sh', ['-c', cmd], { cwd: ROOT, encoding: 'utf8' });
    expect(r.status).toBe(74);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(/EFBIG|ENOSPC/);
    expect(readFileSync(target, 'utf8')).toBe('old contents\n');
    expect(tmpLeft(sub)).toEqual([]);
  });
});

describe('2. nothing from a netlist compiles into a C header', () => {
  it('refuses a name with a line end, and keeps a backslash, "*/" and trigraphs out of comments', () => {
    expect(() => switchingTable({ topology: twoLevel({ name: 'evil *\\\n/ system("x"); /*' }) })).toThrow(HexsalvageInputError);
    const h = exportC(switchingTable({ topology: twoLevel({ name: 'evil *\\/ int x; */ ??/ end' }) }));
    const head = h.slice(0, h.indexOf('*/'));
    expect(head).not.toContain('\\');
    expect(head).toContain('evil');
    const cc = ['cc', 'gcc', 'clang'].find((c) => spawnSync(c, ['--version']).status === 0);
    if (!cc) return;
    const sub = mkdtempSync(join(dir, 'c-'));
    writeFileSync(join(sub, 'hs_table.h'), h);
    writeFileSync(join(sub, 'main.c'), '#include "hs_table.h"\nint main(void) { return 0; }\n');
    execFileSync(cc, ['-std=c99', '-Wall', '-Wextra', '-Werror', '-o', join(sub, 'main'), join(sub, 'main.c'), '-lm']);
  });
});

describe('3. no formula reaches a spreadsheet', () => {
  it('puts an apostrophe before pattern names that start a formula and quotes CR, LF, quotes and commas', () => {
    const leg = twoLevel({ patterns: { '=HYPERLINK("x")': ['T1'], '@cmd': ['T2'] } });
    const csv = exportCsv(switchingTable({ topology: leg }));
    expect(csv).toContain(`"'=HYPERLINK(""x"")"`);
    expect(csv).toContain("'@cmd");
    expect(csv).not.toMatch(/(^|,)=HYPERLINK/m);
    expect(csvCell('a\rb')).toBe('"a\rb"');
    expect(csvCell('a"b')).toBe('"a""b"');
  });
});

describe('4. a file names only files beside it, and messages never quote a file', () => {
  it('refuses a link out of the claims folder, a scenario claimsFile or netlist outside its folder', () => {
    const sub = join(dir, 'claims-links');
    mkdirSync(sub, { recursive: true });
    const outside = write('outside-leg.json', JSON.stringify(twoLevel()));
    symlinkSync(outside, join(sub, 'linked.json'));
    mkdirSync(join(dir, 'elsewhere'), { recursive: true });
    writeFileSync(join(dir, 'elsewhere', 'leg.json'), JSON.stringify(twoLevel()));
    symlinkSync(join(dir, 'elsewhere'), join(sub, 'linkdir'));
    const claim = (topology: string) => JSON.stringify({ claims: [{ name: 'c', topology, faults: [], m: 0.5, loadAngleDeg: [0, 10] }] });
    for (const t of ['linked.json', 'linkdir/leg.json']) {
      writeFileSync(join(sub, 'c.json'), claim(t));
      const r = runBin(['check', join(sub, 'c.json')]);
      oneLine(r);
      expect(r.stderr).toContain('folder of the file that names it');
    }
    const base = { drive: 'd', vdc: 750, topology: 'npc' };
    for (const [key, value] of [
      ['claimsFile', outside],
      ['claimsFile', '../outside-leg.json'],
      ['topology', '../outside-leg.json'],
      ['topology', outside],
    ] as [string, string][]) {
      const sc = join(sub, 'sc.json');
      writeFileSync(sc, JSON.stringify({ ...base, [key]: value }));
      const r = runBin(['report', '--scenario', sc, '--out', join(dir, 'sc.html')]);
      oneLine(r);
      expect(r.stderr).toContain(key);
    }
  });
  it('names the key and the kind of a bad value in a netlist, never its text', () => {
    const p = write('kind.json', JSON.stringify(twoLevel({ devices: [{ id: 'T1', kind: 'thyristor-secret', from: 'P', to: 'out' }] })));
    const r = runBin(['leg', '--topology', p]);
    oneLine(r);
    expect(r.stderr).toContain('devices[0].kind');
    expect(r.stderr).not.toContain('thyristor-secret');
  });
});

describe('5 and 9. work is bounded before it starts', () => {
  const parallel = (n: number) => ({
    name: 'par',
    dcNodes: { P: 1, N: -1 },
    output: 'out',
    devices: [
      ...Array.from({ length: n }, (_, i) => ({ id: `u${i}`, kind: 'mosfet', from: 'P', to: 'out', antiparallelDiode: true })),
      { id: 'd', kind: 'mosfet', from: 'out', to: 'N', antiparallelDiode: true },
    ],
    patterns: { P: Array.from({ length: n }, (_, i) => `u${i}`), N: ['d'] },
  });
  it.each([
    ['21 parallel MOSFETs', parallel(21), 'side by side'],
    ['32 parallel MOSFETs', parallel(32), 'side by side'],
    [
      'a 32-level leg',
      {
        name: 'many',
        dcNodes: Object.fromEntries(Array.from({ length: 32 }, (_, i) => [`V${i}`, 1 - (2 * i) / 31])),
        output: 'out',
        devices: [
          { id: 'a', kind: 'igbt', from: 'V0', to: 'out' },
          { id: 'b', kind: 'igbt', from: 'out', to: 'V31' },
        ],
        patterns: { P: ['a'] },
      },
      'at most 21 DC nodes',
    ],
    [
      '65 devices',
      {
        name: 'big',
        dcNodes: { P: 1, N: -1 },
        output: 'out',
        devices: Array.from({ length: 65 }, (_, i) => ({ id: `d${i}`, kind: 'diode', from: i % 2 ? 'P' : 'out', to: i % 2 ? 'out' : 'N' })),
        patterns: { X: [] },
      },
      'at most 64 devices',
    ],
  ])('refuses %s in well under a second, naming the limit', (_n, leg, hint) => {
    const p = write(`limit-${Math.random().toString(36).slice(2)}.json`, JSON.stringify(leg));
    const t0 = Date.now();
    const r = runBin(['plan', '--topology', p]);
    expect(Date.now() - t0).toBeLessThan(3000);
    oneLine(r);
    expect(r.stderr).toContain(hint);
  });
  it('keeps the limits in one documented place', () => {
    const doc = readFileSync(join(ROOT, 'docs/interface.md'), 'utf8');
    for (const v of Object.values(NETLIST_LIMITS)) expect(doc).toContain(String(v));
  });
  it('refuses --jobs beyond the processors unless forced, a 13-level table, and a scenario switching 20000 times the fundamental', () => {
    oneLine(runBin(['atlas', '--topology', 'npc', '--pairs', '--jobs', '256']));
    const thirteen = {
      name: '13',
      dcNodes: Object.fromEntries(Array.from({ length: 13 }, (_, i) => [`V${i}`, 1 - i / 6])),
      output: 'out',
      devices: [
        { id: 'a', kind: 'igbt', from: 'V0', to: 'out' },
        { id: 'b', kind: 'igbt', from: 'out', to: 'V12' },
      ],
      patterns: { P: ['a'], N: ['b'] },
    };
    const r = runBin(['export', '--format', 'json', '--out', join(dir, 'x.json'), '--topology', write('thirteen.json', JSON.stringify(thirteen))]);
    oneLine(r);
    expect(r.stderr).toContain('at most 11 levels');
    const sc = write(
      'fast.json',
      JSON.stringify({ drive: 'd', vdc: 750, topology: 'npc', fundamentalHz: 50, switchingHz: 1e6, ratedPowerKw: 10, ratedLineVoltageV: 400 }),
    );
    const s = runBin(['report', '--scenario', sc, '--out', join(dir, 'fast.html')]);
    oneLine(s);
    expect(s.stderr).toContain('switchingHz');
  });
});

describe('6. C index types follow the data', () => {
  it('declares every integer table in a type that holds its values (five-level leg, faulted NPC)', () => {
    const ranges: Record<string, [number, number]> = {
      uint8_t: [0, 255],
      int8_t: [-128, 127],
      uint16_t: [0, 65535],
      int16_t: [-32768, 32767],
      uint32_t: [0, 4294967295],
      int32_t: [-2147483648, 2147483647],
    };
    for (const topology of ['npc', JSON.parse(readFileSync(join(ROOT, 'examples/five-level-leg.json'), 'utf8'))]) {
      const h = exportC(switchingTable({ topology, faults: topology === 'npc' ? ['a.outerUpper'] : [] }));
      let checked = 0;
      for (const m of h.matchAll(/static const (u?int\d+_t) (\w+)\[[^=]*= \{([\s\S]*?)\n?\};/g)) {
        const [lo, hi] = ranges[m[1] as string]!;
        if (/0x/.test(m[3] as string)) continue; // gate masks are written in hex, in types of their own
        const values = (m[3] as string)
          .replace(/[{}\s]/g, ' ')
          .split(/[ ,]+/)
          .filter(Boolean)
          .map(Number);
        // one expectation per table (hundreds of thousands of values on the five-level leg)
        const outside = values.filter((v) => !(Number.isInteger(v) && v >= lo && v <= hi));
        expect(outside.slice(0, 5), `${m[2]}: values that ${m[1]} cannot hold`).toEqual([]);
        expect(values.length, `${m[2]} is read`).toBeGreaterThan(0);
        checked++;
      }
      expect(checked).toBeGreaterThan(15);
    }
  });
});

describe('7. the scale of potentials', () => {
  it("refuses potentials outside the documented range, and gives the unit leg's answers scaled inside it", () => {
    for (const v of [1e-160, 1e160, 1e300, 1e308])
      expect(() => planRemedial({ topology: twoLevel({ dcNodes: { P: v, N: -v } }) })).toThrow(/between 0.000001 and 1000000/);
    const unit = planRemedial({ topology: twoLevel() }).mMax;
    for (const k of [1e-5, 1e3]) {
      const scaled = twoLevel({
        dcNodes: { P: k, N: -k },
        devices: [
          { id: 'T1', kind: 'igbt', from: 'P', to: 'out', antiparallelDiode: true, rating: 2 * k },
          { id: 'T2', kind: 'igbt', from: 'out', to: 'N', antiparallelDiode: true, rating: 2 * k },
        ],
      });
      expect(planRemedial({ topology: scaled }).mMax / k).toBeCloseTo(unit, 12);
    }
  });
});

describe('8. a named pipe is refused, not waited on', () => {
  it.each([['check'], ['leg --topology'], ['simulate --topology npc --m 0.5 --load-angle 0 --vdc 700 --current-peak 10 --f1 50 --fsw 3000 --devices']])(
    '%s FIFO: one line at once',
    (cmd) => {
      const fifo = join(dir, `fifo-${Math.random().toString(36).slice(2)}.json`);
      if (spawnSync('mkfifo', [fifo]).status !== 0) return;
      const r = spawnSync(process.execPath, [BIN, ...cmd.split(' '), fifo], { cwd: ROOT, encoding: 'utf8', timeout: 10000 });
      expect(r.signal).toBeNull();
      expect(r.status).toBe(2);
      expect(r.stderr).toContain('regular file');
    },
  );
});

describe('10. a termination signal during a write', () => {
  it.each(['SIGTERM', 'SIGINT', 'SIGHUP'] as const)('%s: the temporary file is removed, the old file untouched, the exit code says so', async (sig) => {
    const sub = mkdtempSync(join(dir, 'sig-'));
    const target = join(sub, 'out.json');
    writeFileSync(target, 'old\n');
    const child = spawn(process.execPath, [BIN, 'export', '--format', 'json', '--topology', 'npc', '--out', target], {
      cwd: ROOT,
      env: { ...process.env, HEXSALVAGE_WRITE_CHUNK: '4096', HEXSALVAGE_WRITE_DELAY_MS: '20' },
    });
    let stderr = '';
    child.stderr.on('data', (d) => {
      stderr += d;
    });
    const done = new Promise<number | null>((res) => child.on('exit', (code) => res(code)));
    // signal once the temporary file exists (the write has begun)
    for (let i = 0; i < 500 && tmpLeft(sub).length === 0; i++) await new Promise((r) => setTimeout(r, 10));
    expect(tmpLeft(sub).length).toBe(1);
    child.kill(sig);
    const code = await done;
    expect(code).toBe(128 + ({ SIGTERM: 15, SIGINT: 2, SIGHUP: 1 } as const)[sig]);
    expect(stderr).toContain(`interrupted by ${sig}`);
    expect(readFileSync(target, 'utf8')).toBe('old\n');
    expect(tmpLeft(sub)).toEqual([]);
  });
});

describe('11 and 12. names that print as something else', () => {
  it('escapes bidirectional, C1 and separator characters in messages', async () => {
    const r = await runInProcess(['plan', '--topology', 'npc', '--fault', 'a.x\u202eY\u009b\u2028\u0085']);
    oneLine(r);
    for (const c of ['\u202e', '\u009b', '\u2028', '\u0085']) expect(r.stderr).not.toContain(c);
    expect(r.stderr).toContain('\\u202e');
  });
  it.each([
    ['a zero-width space', 'T1\u200b'],
    ['a control character', 'T\u0007'],
    ['a right-to-left override', 'T\u202e1'],
  ])('refuses an id with %s at parse time', (_n, id) => {
    const leg = twoLevel({
      devices: [
        { id: 'T1', kind: 'igbt', from: 'P', to: 'out' },
        { id, kind: 'igbt', from: 'out', to: 'N' },
      ],
      patterns: { P: ['T1'], N: [id] },
    });
    const p = write(`id-${Math.random().toString(36).slice(2)}.json`, JSON.stringify(leg));
    const r = runBin(['plot', 'leg', '--topology', p, '--out', join(dir, 'leg.png')]);
    oneLine(r);
    expect(r.stderr).toContain('visible characters');
  });
});

describe('13. input errors, not internal ones', () => {
  it('refuses SOURCE_DATE_EPOCH beyond a date, invalid UTF-8, and a closed standard output', () => {
    const env = { ...process.env, SOURCE_DATE_EPOCH: '99999999999999' };
    const r = spawnSync(process.execPath, [BIN, 'report', '--topology', 'npc', '--out', join(dir, 'd.html')], { cwd: ROOT, env, encoding: 'utf8' });
    oneLine({ code: r.status ?? -1, stderr: r.stderr });
    expect(r.stderr).toContain('SOURCE_DATE_EPOCH');
    const bad = join(dir, 'latin1.json');
    writeFileSync(bad, Buffer.concat([Buffer.from('{"name": "caf'), Buffer.from([0xe9]), Buffer.from('", "dcNodes": {}}')]));
    const u = runBin(['leg', '--topology', bad]);
    oneLine(u);
    expect(u.stderr).toContain('UTF-8');
    const closed = spawnSync('sh', ['-c', `"${process.execPath}" "${BIN}" plan --topology npc >&-`], { cwd: ROOT, encoding: 'utf8' });
    expect(closed.status).toBe(74);
    expect(closed.stderr).toContain('standard output is closed');
  });
  it('names the scenario key behind a simulation option', () => {
    const sc = write(
      'sw.json',
      JSON.stringify({ drive: 'd', vdc: 750, topology: 'npc', fundamentalHz: 50, switchingHz: 100, ratedPowerKw: 10, ratedLineVoltageV: 400 }),
    );
    const r = runBin(['report', '--scenario', sc, '--out', join(dir, 'sw.html')]);
    oneLine(r);
    expect(r.stderr).toContain('switchingHz');
  });
  it.each([
    ['exportC()', () => exportC(undefined as never)],
    ['exportCsv({})', () => exportCsv({} as never)],
    ['legTable()', () => legTable(undefined as never, undefined as never)],
    ['deratingCurve()', () => deratingCurve(undefined as never)],
    ["builtinLeg('__proto__')", () => builtinLeg('__proto__' as never)],
    ['modulateInto with a 2-element buffer', () => createModulator(planRemedial({ topology: 'npc' })).modulateInto(0.1, 0, 0, new Float64Array(2))],
  ])('%s throws HexsalvageInputError', (_n, f) => {
    expect(f).toThrow(HexsalvageInputError);
  });
  it('tells a bad reference (-2) from a polarity without triangles (-1)', () => {
    const mod = createModulator(planRemedial({ topology: 'npc' }));
    expect(mod.modulateInto(Number.NaN, 0, 0, new Float64Array(4))).toBe(-2);
  });
  it("keeps a space between every option and its help in every command's --help", async () => {
    for (const cmd of ['plot', 'atlas', 'simulate', 'report', 'cycle']) {
      const r = await runInProcess([cmd, '--help']);
      for (const line of r.stdout.split('\n').filter((l) => l.startsWith('  --'))) expect(line).toMatch(/^ {2}--\S+( \S+)? +\S/);
      expect(r.stdout).not.toContain('LO,HIatlas');
    }
  });
});

it('leaves no file behind in its folder', () => {
  expect(existsSync(dir)).toBe(true);
});
