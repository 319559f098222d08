import { execFileSync, spawnSync } from 'node:child_process';
import { chmodSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, statSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { createModulator, deratingCurve, HexsalvageInputError, planRemedial } from '@hexsalvage/core';
import { diagramAtlas, plainText } from '@hexsalvage/core/internal';
import { fc, fcParams } from '../support/fc.js';
import { BIN, ROOT, runBin, runInProcess } from '../support/cli.js';

const dir = mkdtempSync(join(tmpdir(), 'hexsalvage-hard-'));
const oneLine = (r: { code: number; stderr: string }) => {
  expect(r.code).toBe(2);
  expect(r.stderr.trim().split('\n')).toHaveLength(1);
};

describe('command line (strict)', () => {
  it.each([
    [['plan', '--topology', 'npc', '-x', 'stray'], '-x'],
    [['plan', '--topology', 'npc', 'stray'], 'no stray words'],
    [['plot', 'diagram', 'leg', '--topology', 'npc', '--out', join(dir, 'x.svg')], 'at most 1 argument'],
    [['plan', '--topology', 'npc', '--load-angle', '10', '--load-angle', '20'], 'at most once'],
    [['plan', '--topology', 'npc', '--load-angle', '0x10'], 'a decimal number'],
    [['plan', '--topology', 'npc', '--load-angle', 'Infinity'], 'a decimal number'],
    [['plot', 'diagram', '--topology', 'npc', '--m', '-5', '--out', join(dir, 'x.svg')], 'from 0 to 10'],
    [['plot', 'diagram', '--topology', 'npc', '--m', '1e308', '--out', join(dir, 'x.svg')], 'from 0 to 10'],
    [['cycle', '--topology', 'npc', '--m', '0.5', '--current', '1e307', '--json'], 'above 0 to 1000000000'],
    [['plot', 'diagram', '--topology', 'npc', '--polarity', 'constructor', '--out', join(dir, 'x.svg')], 'three characters'],
    [['table', '--topology', 'npc', '--polarity', 'toString'], 'three characters'],
    [['vectors', '--topology', 'npc', '--polarity', '__proto__'], 'three characters'],
  ])('refuses %j with one line naming %s', async (argv, hint) => {
    const r = await runInProcess(argv);
    oneLine(r);
    expect(r.stderr).toContain(hint);
  });

  it('escapes control characters and cuts long user text in errors', async () => {
    const nl = await runInProcess(['plan', '--topology', 'npc', '--fault', 'a.x\ny']);
    oneLine(nl);
    expect(nl.stderr).toContain('a.x\\ny');
    const long = await runInProcess(['plan', '--topology', 'npc', '--fault', `a.${'x'.repeat(100000)}`]);
    oneLine(long);
    expect(long.stderr.length).toBeLessThan(1000);
    expect(plainText('a\u0007b\u2028c', 80)).toBe('a\\u0007b\\u2028c');
  });

  it('prints only ASCII in --help (what a user may paste back parses)', async () => {
    for (const c of ['plan', 'sweep', 'cycle', 'plot', 'export']) {
      const r = await runInProcess([c, '--help']);
      expect([...r.stdout].filter((c) => (c.codePointAt(0) as number) > 0x7f)).toEqual([]);
    }
    expect((await runInProcess(['plan', '--topology', 'npc', '--load-angle', '-180'])).code).toBe(0);
  });

  it('keeps :short in the vectors text', async () => {
    const r = await runInProcess(['vectors', '--topology', 'npc', '--fault', 'a.outerUpper:short', '--polarity', '+--']);
    expect(r.stdout).toContain('a.outerUpper:short');
  });

  it('table --polarity filters the JSON and the flag totals', async () => {
    const one = JSON.parse((await runInProcess(['table', '--topology', 'anpc-hybrid', '--fault', 'a.innerUpper', '--polarity', '+--', '--json'])).stdout);
    expect(Object.keys(one.polarities)).toEqual(['+--']);
    expect(one.flags.lineDevicesAtPwm.every((f: { polarity: string }) => f.polarity === '+--')).toBe(true);
    const text = (await runInProcess(['table', '--topology', 'anpc-hybrid', '--fault', 'a.innerUpper', '--polarity', '+--'])).stdout;
    expect(text).toContain(`Flags (polarity +--): ${one.flags.lineDevicesAtPwm.length} triangles`);
  });
});

describe('files read', () => {
  const npc = JSON.parse(readFileSync(join(ROOT, 'examples/five-level-leg.json'), 'utf8'));
  const write = (name: string, text: string | Buffer) => {
    const p = join(dir, name);
    writeFileSync(p, text);
    return p;
  };

  it('refuses devices, deep nesting, duplicate keys and non-string descriptions; accepts a BOM', async () => {
    oneLine(await runInProcess(['leg', '--topology', '/dev/zero']));
    oneLine(await runInProcess(['leg', '--topology', write('deep.json', `${'['.repeat(100000)}${']'.repeat(100000)}`)]));
    const dup = await runInProcess(['leg', '--topology', write('dup.json', '{"name": "a", "name": "b"}')]);
    oneLine(dup);
    expect(dup.stderr).toContain('each key at most once');
    oneLine(await runInProcess(['leg', '--topology', write('desc.json', JSON.stringify({ ...npc, description: 5 }))]));
    const bom = await runInProcess([
      'leg',
      '--topology',
      write('bom.json', Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(JSON.stringify(npc))])),
    ]);
    expect(bom.code).toBe(0);
    const big = await runInProcess(['leg', '--topology', write('big.json', ' '.repeat(1024 * 1024 + 1))]);
    oneLine(big);
    expect(big.stderr).toContain('at most 1048576 bytes');
  });

  it('refuses duplicated and all-equal DC potentials', async () => {
    oneLine(await runInProcess(['leg', '--topology', write('dupdc.json', JSON.stringify({ ...npc, dcNodes: { ...npc.dcNodes, Q: 1 } }))]));
    const flat = Object.fromEntries(Object.keys(npc.dcNodes).map((k) => [k, 0]));
    oneLine(await runInProcess(['leg', '--topology', write('flat.json', JSON.stringify({ ...npc, dcNodes: flat }))]));
  });

  it('gives the same answer, scaled, for a leg written at another scale of potential', async () => {
    const base = JSON.parse((await runInProcess(['plan', '--topology', join(ROOT, 'examples/five-level-leg.json'), '--fault', 'a.s2', '--json'])).stdout);
    for (const f of [1000, 1e-6]) {
      const scaled = { ...npc, dcNodes: Object.fromEntries(Object.entries(npc.dcNodes).map(([k, v]) => [k, (v as number) * f])) };
      const r = await runInProcess(['plan', '--topology', write(`scaled-${f}.json`, JSON.stringify(scaled)), '--fault', 'a.s2', '--json']);
      expect(r.code).toBe(0);
      const p = JSON.parse(r.stdout);
      expect(p.mMax / f).toBeCloseTo(base.mMax, 9);
      expect(p.mMaxHealthy / f).toBeCloseTo(base.mMaxHealthy, 9);
    }
  });

  it('confines claim netlists to the claims folder and never echoes a file', () => {
    const sub = join(dir, 'claims');
    mkdirSync(sub, { recursive: true });
    const claim = (topology: string) => JSON.stringify({ claims: [{ name: 'c', topology, faults: [], m: 0.5, loadAngleDeg: [0, 10] }] });
    const escape = runBin(['check', write('claims/escape.json', claim('../../../../etc/passwd'))]);
    oneLine(escape);
    expect(escape.stderr).toContain('folder of the file that names it');
    expect(escape.stderr).not.toContain('root:');
    const missing = runBin(['check', write('claims/missing.json', claim('nope.json'))]);
    oneLine(missing);
    // a path written in the file is its content: the message names where it is, not what it says
    expect(missing.stderr).toContain('claims[0]');
    expect(missing.stderr).not.toContain('nope.json');
    writeFileSync(join(sub, 'secret.json'), 'root:x:0:0:root:/root:/bin/bash');
    const secret = runBin(['check', write('claims/secret-claim.json', claim('secret.json'))]);
    oneLine(secret);
    expect(secret.stderr).not.toContain('root:x');
    oneLine(runBin(['check', write('claims/top.json', '{"claims": [], "extra": 1}')]));
    oneLine(runBin(['check', write('claims/proto.json', '{"__proto__": {}, "claims": []}')]));
  });

  it("names the claims file and the claim's place (never its content) when report --claims meets a bad claim", async () => {
    const p = write(
      'bad-report-claims.json',
      JSON.stringify({ claims: [{ name: 'pump', topology: 'npc', faults: ['a.nope'], m: 0.5, loadAngleDeg: [0, 10] }] }),
    );
    const r = await runInProcess(['report', '--topology', 'npc', '--claims', p, '--out', join(dir, 'r.html')]);
    oneLine(r);
    expect(r.stderr).toContain(p);
    expect(r.stderr).toContain('claims[0]');
    expect(r.stderr).not.toContain('pump');
  });
});

describe('files written (--out)', () => {
  it('refuses missing folders and non-regular targets, keeps the mode, leaves no temporary file', async () => {
    const missing = join(dir, 'o', 'missing', 'x.svg');
    oneLine(await runInProcess(['plot', 'diagram', '--topology', 'npc', '--out', missing]));
    expect(existsSync(join(dir, 'o'))).toBe(false);
    mkdirSync(join(dir, 'folder.svg'));
    oneLine(await runInProcess(['plot', 'diagram', '--topology', 'npc', '--out', join(dir, 'folder.svg')]));
    const kept = join(dir, 'kept.svg');
    writeFileSync(kept, 'old');
    chmodSync(kept, 0o600);
    expect((await runInProcess(['plot', 'diagram', '--topology', 'npc', '--out', kept])).code).toBe(0);
    expect(statSync(kept).mode & 0o777).toBe(0o600);
    expect(readFileSync(kept, 'utf8')).toContain('<svg');
    expect(readdirSync(dir).filter((f) => f.endsWith('.tmp'))).toEqual([]);
  });

  it('does not follow a link planted at the old temporary name', async () => {
    const target = join(dir, 'victim.txt');
    writeFileSync(target, 'keep');
    const out = join(dir, 'planted.svg');
    symlinkSync(target, `${out}.${process.pid}.tmp`);
    expect((await runInProcess(['plot', 'diagram', '--topology', 'npc', '--out', out])).code).toBe(0);
    expect(readFileSync(target, 'utf8')).toBe('keep');
  });

  it('ends quietly on a closed pipe and with one line on a full device', () => {
    const head = spawnSync('sh', ['-c', `node ${BIN} table --topology npc --json | head -c 10 >/dev/null`], { cwd: ROOT, encoding: 'utf8' });
    expect(head.stderr).toBe('');
    if (existsSync('/dev/full')) {
      const full = spawnSync('sh', ['-c', `node ${BIN} plan --topology npc > /dev/full`], { cwd: ROOT, encoding: 'utf8' });
      expect(full.status).not.toBe(0);
      expect(full.stderr.trim().split('\n')).toHaveLength(1);
      expect(full.stderr).toContain('ENOSPC');
    }
  });
});

describe('library boundary', () => {
  const plan = planRemedial({ topology: 'npc', faults: ['a.outerUpper'] });
  it.each([
    ['planRemedial(undefined)', () => planRemedial(undefined as never)],
    ['createModulator({})', () => createModulator({} as never)],
    ['modulate(1e308, 1e308)', () => createModulator(plan).modulate(1e308, 1e308, '+-?')],
    ['deratingCurve step 0', () => deratingCurve(diagramAtlas({ topology: 'npc' }), { stepDeg: 0 })],
    ['deratingCurve from 1e308', () => deratingCurve(diagramAtlas({ topology: 'npc' }), { fromDeg: 1e308 })],
    ['deratingCurve step -1', () => deratingCurve(diagramAtlas({ topology: 'npc' }), { stepDeg: -1 })],
    ['deratingCurve step NaN', () => deratingCurve(diagramAtlas({ topology: 'npc' }), { stepDeg: Number.NaN })],
    ['deratingCurve margin 200', () => deratingCurve(diagramAtlas({ topology: 'npc' }), { polarityMarginDeg: 200 })],
    ['planRemedial margin 200', () => planRemedial({ topology: 'npc', polarityMarginDeg: 200 })],
  ])('%s throws a typed error', (_, f) => {
    expect(f).toThrow(HexsalvageInputError);
  });
  it('returns -2 from modulateInto for a reference beyond the limit (told apart from -1, no triangles), never NaN', () => {
    const out = new Float64Array(4);
    expect(createModulator(plan).modulateInto(1e308, 1e308, 4, out)).toBe(-2);
  });
  it('runs the README library example exactly as written from the repository root', () => {
    const md = readFileSync(join(ROOT, 'README.md'), 'utf8');
    const code = /From code[\s\S]*?```js\n([\s\S]*?)```/.exec(md)?.[1] as string;
    expect(code).toContain("from '@hexsalvage/core'");
    const out = execFileSync(process.execPath, ['--input-type=module', '-e', code], { cwd: ROOT, encoding: 'utf8' });
    expect(out.trim().split(/\s+/).map(Number)[0]).toBeCloseTo(1 / Math.sqrt(3), 12);
  });
});

describe('sweep marks', () => {
  it('marks the plateau edges and gives -180 and 180 the same verdict', async () => {
    const csv = (await runInProcess(['sweep', '--topology', 'npc', '--fault', 'a.outerUpper', '--from', '-180', '--to', '180', '--step', '30', '--csv'])).stdout
      .trim()
      .split('\n')
      .slice(1)
      .map((l) => l.split(','));
    const marked = csv.filter((r) => r[5] === '1').map((r) => Number(r[0]));
    expect(marked).toEqual([-180, -120, 120, 180]);
  });
});

describe('fuzzing the command line (seeded)', () => {
  const netlist = fc.record(
    {
      name: fc.oneof(fc.constant('leg'), fc.string()),
      dcNodes: fc.oneof(fc.constant({ P: 1, O: 0, N: -1 }), fc.dictionary(fc.string({ maxLength: 3 }), fc.oneof(fc.double(), fc.integer())), fc.anything()),
      output: fc.constantFrom('out', 'X', 'P'),
      devices: fc.oneof(
        fc.constant(JSON.parse(readFileSync(join(ROOT, 'examples/five-level-leg.json'), 'utf8')).devices),
        fc.array(
          fc.record({
            id: fc.string({ maxLength: 4 }),
            kind: fc.constantFrom('igbt', 'mosfet', 'diode', 'x'),
            from: fc.constantFrom('P', 'O', 'N', 'out', 'X'),
            to: fc.constantFrom('P', 'O', 'N', 'out', 'X'),
            rating: fc.oneof(fc.constant(undefined), fc.double()),
          }),
          { maxLength: 4 },
        ),
      ),
      patterns: fc.oneof(fc.constant({ P: [] }), fc.dictionary(fc.string({ maxLength: 3 }), fc.array(fc.string({ maxLength: 4 }), { maxLength: 3 }))),
    },
    { requiredKeys: [] },
  );
  const word = fc.oneof(
    fc.constantFrom(
      '--topology',
      '--fault',
      '--json',
      '--load-angle',
      '--polarity-margin',
      '--polarity',
      '--level-steps',
      '--ignore-ratings',
      '--m',
      '--step',
      '--from',
      '--to',
      '--csv',
      '--explore',
      '--out',
    ),
    fc.constantFrom(
      'npc',
      'tnpc',
      'two-level',
      'a.outerUpper',
      'b.clampUpper:short',
      '+-?',
      '---',
      'adjacent',
      'any',
      '30',
      '-200',
      '1e3',
      '0x1',
      'NaN',
      '',
      '-',
      '--',
      'constructor',
      '__proto__',
    ),
    fc.string({ maxLength: 12 }),
  );
  it('exits 0 with a valid document, or 2 with one line, on random argument vectors and netlists', async () => {
    let i = 0;
    await fc.assert(
      fc.asyncProperty(
        fc.constantFrom('leg', 'vectors', 'plan', 'sweep', 'table', 'cycle', 'check', 'nope'),
        fc.array(word, { maxLength: 8 }),
        fc.option(netlist, { nil: undefined }),
        fc.boolean(),
        async (cmd, rest, leg, json) => {
          const argv = [cmd, ...rest];
          if (leg !== undefined) {
            const p = join(dir, `fuzz-${i++}.json`);
            writeFileSync(
              p,
              JSON.stringify(cmd === 'check' ? { claims: [{ name: 'z', topology: 'leg.json', faults: [], m: 0.5, loadAngleDeg: [0, 1] }] } : leg) ?? 'null',
            );
            if (cmd === 'check') {
              writeFileSync(join(dir, 'leg.json'), JSON.stringify(leg) ?? 'null');
              argv.splice(1, 0, p);
            } else argv.push('--topology', p);
          }
          if (json) argv.push('--json');
          const r = await runInProcess(argv);
          expect([0, 1, 2]).toContain(r.code);
          if (r.code === 2) expect(r.stderr.trim().split('\n')).toHaveLength(1);
          if (r.code === 0 && argv.includes('--json') && !argv.includes('--help') && !argv.includes('--csv')) expect(() => JSON.parse(r.stdout)).not.toThrow();
          if (r.code === 0) expect(r.stdout).not.toMatch(/\bNaN\b|Infinity|undefined/);
        },
      ),
      fcParams(250),
    );
  });
});
