// Benchmarks (`pnpm bench`): wall-clock figures on this machine, printed, never asserted.
import { performance } from 'node:perf_hooks';
import { leanScan } from './leanScan.mjs';
import { msPerRun } from './timing.mjs';
import { BUILTIN_TOPOLOGIES, builtinLeg, diagramAtlas, expandElements, modulationLimit, planRemedial } from '../packages/core/dist/internal.js';

function time(label, fn, minMs = 1500) {
  const { ms: per, runs: n } = msPerRun(fn, minMs);
  console.log(`${label.padEnd(58)} ${per.toFixed(3).padStart(10)} ms/op  (${n} runs)`);
  return per;
}

console.log(`node ${process.version}, ${process.platform}/${process.arch}`);
time('planRemedial npc, a.outerUpper, φ = 30°, δ = 5°', () =>
  planRemedial({ topology: 'npc', faults: ['a.outerUpper'], loadAngleDeg: 30, polarityMarginDeg: 5, remedies: false }),
);
time('planRemedial anpc-hybrid healthy', () => planRemedial({ topology: 'anpc-hybrid', remedies: false }));

// Version 2 (ratings, commutation, admissible tiling, mMaxBalanced) against the first version's
// rules on the same code (--ignore-ratings --level-steps any), one faulted case per built-in leg:
// the median of repeated single calls (leg tables and diagrams cached after the first), so that a
// garbage collection does not weigh on one figure.
function median(fn, runs = 600) {
  for (let i = 0; i < 100; i++) fn();
  const t = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    fn();
    t.push(performance.now() - t0);
  }
  return t.sort((a, b) => a - b)[runs >> 1];
}
// Cold: every single fault of every built-in leg in both modes, each planned once in this process
// (its leg tables and any new diagrams are built on the way; later calls find them cached).
{
  const cases = BUILTIN_TOPOLOGIES.flatMap((t) => expandElements(builtinLeg(t)).flatMap((e) => ['open', 'short'].map((m) => [t, `b.${e.id}:${m}`])));
  const t0 = performance.now();
  for (const [topology, f] of cases) planRemedial({ topology, faults: [f], loadAngleDeg: 17, polarityMarginDeg: 1, remedies: false });
  const ms = performance.now() - t0;
  console.log(
    `planRemedial, first call of each of ${cases.length} single faults (cold tables)`.padEnd(58),
    `${(ms / cases.length).toFixed(3).padStart(10)} ms per plan`,
  );
}
for (const [topology, fault, phi, delta] of [
  ['two-level', 'a.upper', 20, 0],
  ['npc', 'a.outerUpper', 30, 5],
  ['npc', 'a.clampUpper', 25, 0],
  ['anpc', 'a.clampUpper', -30, 2],
  ['anpc-hybrid', 'a.innerUpper', 25, 3],
  ['tnpc', 'a.neutralToOut', 25, 0],
]) {
  const o = { topology, faults: [fault], loadAngleDeg: phi, polarityMarginDeg: delta };
  const v2 = median(() => planRemedial({ ...o, remedies: false }));
  const v1 = median(() => planRemedial({ ...o, ignoreRatings: true, levelSteps: 'any', remedies: false }));
  console.log(
    `planRemedial ${topology} ${fault} φ = ${phi}°, δ = ${delta}°`.padEnd(58),
    `${v2.toFixed(3).padStart(10)} ms median  (first-version rules ${v1.toFixed(3)} ms, ratio ${(v2 / v1).toFixed(2)})`,
  );
}

// A plan with its remedies (clear-shorts, bypass-<phase>, both: each a further analysis at the same
// load angle) against the plain plan, medians of repeated calls. Goal: at most 3×.
{
  const ratios = [];
  for (const [topology, fault] of [
    ['npc', 'a.outerUpper:short'],
    ['npc', 'a.innerUpper'],
    ['anpc', 'a.innerUpper:short'],
    ['anpc-hybrid', 'a.innerUpper'],
    ['tnpc', 'a.upper:short'],
  ]) {
    const o = { topology, faults: [fault], loadAngleDeg: 25, polarityMarginDeg: 2 };
    const plain = median(() => planRemedial({ ...o, remedies: false }), 300);
    const full = median(() => planRemedial(o), 300);
    ratios.push(full / plain);
    console.log(
      `planRemedial with remedies, ${topology} ${fault}`.padEnd(58),
      `${full.toFixed(3).padStart(10)} ms median  (plain ${plain.toFixed(3)} ms, ratio ${(full / plain).toFixed(2)}; goal ≤ 3)`,
    );
  }
  console.log(
    'plan with remedies / plain plan, worst ratio'.padEnd(58),
    `${Math.max(...ratios)
      .toFixed(2)
      .padStart(10)}        (goal ≤ 3)`,
  );
}

const faults = BUILTIN_TOPOLOGIES.flatMap((t) => expandElements(builtinLeg(t)).map((e) => [t, `a.${e.id}`]));
let evaluations = 0;
const atlasMs = time(
  `diagrams + limits: ${faults.length} single open faults × φ = -90…90° step 1°`,
  () => {
    evaluations = 0;
    for (const [topology, f] of faults) {
      const atlas = diagramAtlas({ topology, faults: [f] });
      for (let phi = -90; phi <= 90; phi++) {
        modulationLimit(atlas.faulted, phi, 0);
        evaluations++;
      }
    }
  },
  3000,
);
console.log(`  = ${evaluations} exact limits, ${((atlasMs * 1000) / evaluations).toFixed(1)} µs per limit including the atlas build`);

// modulate: fast grid paths against the plain linear scan over all triangles (locateReference)
const { createModulator, locateReference, POLARITY_STRINGS } = await import('../packages/core/dist/internal.js');
const N = 200000;
let seed = 12345;
const rnd = () => (seed = (seed * 1103515245 + 12345) >>> 0) / 2 ** 32;
// references inside each polarity's admissible tiling (r below 98 % of its reach), and a set outside it
function references(plan, outside) {
  const usable = POLARITY_STRINGS.map((p, k) => [k, plan.polarities[p].reach]).filter(([, r]) => r > 0);
  const refs = new Float64Array(2 * N);
  const pols = new Int32Array(N);
  for (let i = 0; i < N; i++) {
    const [k, radius] = usable[Math.floor(rnd() * usable.length)];
    const r = outside ? 1.5 + rnd() : 0.98 * radius * Math.sqrt(rnd());
    const th = 2 * Math.PI * rnd();
    refs[2 * i] = r * Math.cos(th);
    refs[2 * i + 1] = r * Math.sin(th);
    pols[i] = k;
  }
  return { refs, pols };
}
for (const [label, faults] of [
  ['healthy npc', []],
  ['npc a.outerUpper', ['a.outerUpper']],
  ['five-level leg', null],
]) {
  const plan =
    faults === null
      ? planRemedial({ topology: JSON.parse((await import('node:fs')).readFileSync(new URL('../examples/five-level-leg.json', import.meta.url), 'utf8')) })
      : planRemedial({ topology: 'npc', faults });
  const mod = createModulator(plan);
  const out = new Float64Array(4);
  const { refs, pols } = references(plan, false);
  const names = POLARITY_STRINGS;
  const rate = (ms) => `${(((N / ms) * 1000) / 1e6).toFixed(2)} M calls/s`;
  const into = time(
    `modulateInto (${label}), ${N} refs`,
    () => {
      for (let i = 0; i < N; i++) mod.modulateInto(refs[2 * i], refs[2 * i + 1], pols[i], out);
    },
    1000,
  );
  const obj = time(
    `modulate (${label}), ${N} refs`,
    () => {
      for (let i = 0; i < N; i++) mod.modulate(refs[2 * i], refs[2 * i + 1], names[pols[i]]);
    },
    1000,
  );
  const naive = time(
    `linear scan, all triangles (${label}), ${N} refs`,
    () => {
      for (let i = 0; i < N; i++) locateReference(plan.polarities[names[pols[i]]], refs[2 * i], refs[2 * i + 1]);
    },
    1000,
  );
  // a fair baseline as well (bench/leanScan.mjs): flat matrices, same arithmetic, no grid
  const scan = leanScan(plan, out);
  const far = references(plan, true);
  const clampMs = time(
    `modulateInto, references outside the hull, clamped (${label}), ${N} refs`,
    () => {
      for (let i = 0; i < N; i++) mod.modulateInto(far.refs[2 * i], far.refs[2 * i + 1], far.pols[i], out);
    },
    1000,
  );
  console.log(`  ${label}: clamped references ${rate(clampMs)}`);
  const lean = time(
    `linear scan, flat and allocation-free (${label}), ${N} refs`,
    () => {
      for (let i = 0; i < N; i++) scan(refs[2 * i], refs[2 * i + 1], pols[i]);
    },
    1000,
  );
  console.log(
    `  ${label}: modulateInto ${rate(into)}, modulate ${rate(obj)}, locateReference scan ${rate(naive)}, lean linear scan ${rate(lean)}; modulateInto is ${(naive / into).toFixed(1)}x the locateReference scan and ${(lean / into).toFixed(1)}x the lean scan`,
  );
}

// One simulated period at fsw/f1 = 200 on a three-level leg, beside a plan of the same case.
{
  const { simulatePeriod } = await import('../packages/core/dist/internal.js');
  const o = { topology: 'npc', faults: ['a.outerUpper'], loadAngleDeg: 30, polarityMarginDeg: 5 };
  const planMs = median(() => planRemedial(o), 200);
  const simMs = median(() => simulatePeriod({ ...o, m: 0.5, vdc: 750, currentPeak: 150, f1: 50, fsw: 10000 }), 20);
  console.log(
    `${'simulatePeriod npc a.outerUpper, fsw/f1 = 200, healthy beside'.padEnd(58)} ${simMs.toFixed(1).padStart(10)} ms median  (planRemedial of the case ${planMs.toFixed(3)} ms)`,
  );
}

// The rotating-reference goals, one leg per process (see bench/rotating.mjs). Goals: modulateInto
// ≥ 1.5x the lean scan on the faulted NPC, ≥ 10x on the five-level leg; modulate ≤ 2x modulateInto.
{
  const { spawnSync } = await import('node:child_process');
  for (const label of ['healthy npc', 'npc a.outerUpper', 'five-level leg']) {
    const r = spawnSync(process.execPath, [new URL('./rotating.mjs', import.meta.url).pathname, label], { encoding: 'utf8' });
    process.stdout.write(r.stdout);
  }
  // the C header's runtime and locator, compiled (bench/cRuntime.mjs)
  {
    const r = spawnSync(process.execPath, [new URL('./cRuntime.mjs', import.meta.url).pathname], { encoding: 'utf8' });
    process.stdout.write(r.stdout || r.stderr);
  }
  // every single fault of every built-in leg and of the five-level example, one process per leg
  // (goal: modulateInto ≥ 1.0x the lean scan on each; ≥ 10x on the five-level leg, above)
  console.log('modulateInto against the lean scan, every single fault (bench/modulatorSweep.mjs):');
  for (const leg of [...BUILTIN_TOPOLOGIES, new URL('../examples/five-level-leg.json', import.meta.url).pathname]) {
    const r = spawnSync(process.execPath, [new URL('./modulatorSweep.mjs', import.meta.url).pathname, leg], { encoding: 'utf8' });
    process.stdout.write(r.stdout || r.stderr);
  }
}
