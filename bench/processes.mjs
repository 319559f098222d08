// Whole-process figures for the speed goals users feel (`pnpm bench` runs this after run.mjs):
// start-up, the fault atlases, the five-level double-fault atlas against its single-fault atlas,
// `report` on a 9-level leg against a three-level one, and the peak memory of `report` on an
// 11-level leg.
// Commands run in turn (A B A B …) and the ratio is taken pair by pair, so that a drift in the
// shared machine's speed moves both sides; medians printed.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, openSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { fileURLToPath } from 'node:url';
import { medianOf } from './timing.mjs';

const BIN = fileURLToPath(new URL('../packages/cli/bin/hexsalvage.mjs', import.meta.url));
const RUNS = 7;

/**
 * An N-level diode-clamped leg (a bench input, not a built-in): N - 1 switches above the output and
 * N - 1 below, each with its antiparallel diode, clamp diodes from each inner DC node to the chain.
 */
function diodeClampedLeg(n) {
  const m = n - 1;
  const dc = Object.fromEntries(Array.from({ length: n }, (_, i) => [`V${i}`, Number((1 - (2 * i) / (n - 1)).toFixed(12))]));
  const names = Object.keys(dc);
  const upper = [names[0], ...Array.from({ length: m - 1 }, (_, i) => `A${i + 1}`), 'out'];
  const lower = ['out', ...Array.from({ length: m - 1 }, (_, i) => `B${i + 1}`), names[n - 1]];
  const devices = [];
  for (let i = 0; i < m; i++) devices.push({ id: `s${i + 1}`, kind: 'igbt', from: upper[i], to: upper[i + 1], antiparallelDiode: true });
  for (let i = 0; i < m; i++) devices.push({ id: `s${m + i + 1}`, kind: 'igbt', from: lower[i], to: lower[i + 1], antiparallelDiode: true });
  for (let i = 1; i < m; i++) {
    devices.push({ id: `dA${i}`, kind: 'diode', from: names[i], to: `A${i}` });
    devices.push({ id: `dB${i}`, kind: 'diode', from: `B${i}`, to: names[i] });
  }
  // level L (0 = lowest): the m consecutive switches starting after the top n - 1 - L
  const patterns = Object.fromEntries(Array.from({ length: n }, (_, l) => [`L${l}`, Array.from({ length: m }, (_, j) => `s${n - l + j}`)]));
  return { name: `${n}-level diode-clamped (bench)`, dcNodes: dc, output: 'out', devices, patterns };
}

// output discarded into /dev/null opened for writing, as a shell's `> /dev/null` does (Node's
// 'ignore' opens it read-write, which the CLI takes for a closed standard output: exit 74)
const NULL_OUT = openSync('/dev/null', 'w');

function wall(args) {
  const t0 = performance.now();
  const r = spawnSync(process.execPath, args, { stdio: ['ignore', NULL_OUT, 'pipe'] });
  const ms = performance.now() - t0;
  if (r.status !== 0 && r.status !== 1) throw new Error(`${args.join(' ')} exited ${r.status}: ${r.stderr}`);
  return ms;
}

function paired(label, a, b, goal) {
  wall(a);
  wall(b);
  const ta = [];
  const tb = [];
  const ratio = [];
  for (let i = 0; i < RUNS; i++) {
    const x = wall(a);
    const y = wall(b);
    ta.push(x);
    tb.push(y);
    ratio.push(x / y);
  }
  console.log(
    `${label.padEnd(58)} ${medianOf(ta).toFixed(0).padStart(6)} ms vs ${medianOf(tb).toFixed(0).padStart(5)} ms, ratio ${medianOf(ratio).toFixed(2)} (goal ≤ ${goal})`,
  );
}

function alone(label, args, goalMs) {
  wall(args);
  const t = [];
  for (let i = 0; i < RUNS; i++) t.push(wall(args));
  const med = medianOf(t);
  console.log(`${label.padEnd(58)} ${med.toFixed(0).padStart(6)} ms median (goal ≤ ${goalMs} ms)`);
}

const dir = mkdtempSync(join(tmpdir(), 'hexsalvage-bench-'));
try {
  const leg9 = join(dir, 'leg9.json');
  writeFileSync(leg9, JSON.stringify(diodeClampedLeg(9)));
  const out = (name) => join(dir, name);
  console.log(`whole processes, median of ${RUNS} paired runs:`);
  paired('--version against node -e 0', [BIN, '--version'], ['-e', '0'], 1.3);
  // the fault atlas: every single fault of every built-in leg in both modes over 181 load angles,
  // in one process (start-up included), and the ANPC double-fault atlas of open faults on 2 threads
  const CORE = new URL('../packages/core/dist/internal.js', import.meta.url).href;
  const allLegs = `const { BUILTIN_TOPOLOGIES, faultAtlas } = await import(${JSON.stringify(CORE)}); for (const t of BUILTIN_TOPOLOGIES) faultAtlas({ topology: t, stepDeg: 1 });`;
  alone('atlas, every single fault of the 5 built-in legs, 181 angles', ['--input-type=module', '-e', allLegs], 1000);
  alone(
    'atlas --pairs, ANPC open faults, 37 angles, --jobs 2',
    [BIN, 'atlas', '--topology', 'anpc', '--modes', 'open', '--pairs', '--step', '5', '--jobs', '2', '--json'],
    10000,
  );
  // the five-level example's double open faults on 2 threads against its single-fault atlas on one
  // (both modes), start-up included (issue "speed": goal ≤ 20)
  const FIVE = fileURLToPath(new URL('../examples/five-level-leg.json', import.meta.url));
  paired(
    'atlas --pairs five-level open --jobs 2 / single faults --jobs 1',
    [BIN, 'atlas', '--topology', FIVE, '--modes', 'open', '--pairs', '--jobs', '2', '--json'],
    [BIN, 'atlas', '--topology', FIVE, '--jobs', '1', '--json'],
    20,
  );
  paired(
    'report, 9-level diode-clamped leg against npc',
    [BIN, 'report', '--topology', leg9, '--out', out('r9.html')],
    [BIN, 'report', '--topology', 'npc', '--out', out('r3.html')],
    4,
  );
  // peak memory of an 11-level report: the CLI's main run in a process that then prints its own
  // peak resident set (the operating system's figure, kilobytes), largest of three runs
  const leg11 = join(dir, 'leg11.json');
  writeFileSync(leg11, JSON.stringify(diodeClampedLeg(11)));
  const MAIN = new URL('../packages/cli/dist/main.js', import.meta.url).href;
  const args = ['report', '--topology', leg11, '--out', out('r11.html')];
  const probe = `const { main } = await import(${JSON.stringify(MAIN)}); const code = await main(${JSON.stringify(args)}, { stdout: async () => {}, stderr: (t) => process.stderr.write(t) }); if (code !== 0) process.exit(code); process.stdout.write(String(process.resourceUsage().maxRSS));`;
  const peaks = [0, 1, 2].map(() => {
    const r = spawnSync(process.execPath, ['--input-type=module', '-e', probe], { encoding: 'utf8' });
    if (r.status !== 0) throw new Error(`report of an 11-level leg exited ${r.status}: ${r.stderr}`);
    return Number(r.stdout) / 1024;
  });
  console.log(
    `${'report, 11-level diode-clamped leg, peak memory'.padEnd(58)} ${Math.max(...peaks)
      .toFixed(0)
      .padStart(6)} MB largest of 3 (goal < 200 MB)`,
  );
} finally {
  rmSync(dir, { recursive: true, force: true });
}
