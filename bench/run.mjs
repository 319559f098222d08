// Benchmarks (`pnpm bench`): wall-clock figures on this machine, printed, never asserted.
import { performance } from 'node:perf_hooks';
import { BUILTIN_TOPOLOGIES, builtinLeg, diagramAtlas, expandElements, modulationLimit, planRemedial } from '../packages/core/dist/index.js';

function time(label, fn, minMs = 1500) {
  fn(); // warm-up
  let n = 0;
  const t0 = performance.now();
  let t = t0;
  while (t - t0 < minMs) {
    fn();
    n++;
    t = performance.now();
  }
  const per = (t - t0) / n;
  console.log(`${label.padEnd(58)} ${per.toFixed(3).padStart(10)} ms/op  (${n} runs)`);
  return per;
}

console.log(`node ${process.version}, ${process.platform}/${process.arch}`);
time('planRemedial npc, a.outerUpper, φ = 30°, δ = 5°', () => planRemedial({ topology: 'npc', faults: ['a.outerUpper'], loadAngleDeg: 30, polarityMarginDeg: 5 }));
time('planRemedial anpc-hybrid healthy', () => planRemedial({ topology: 'anpc-hybrid' }));

const faults = BUILTIN_TOPOLOGIES.flatMap((t) => expandElements(builtinLeg(t)).map((e) => [t, `a.${e.id}`]));
let evaluations = 0;
const atlasMs = time(`atlas: ${faults.length} single open faults × φ = -90…90° step 1°`, () => {
  evaluations = 0;
  for (const [topology, f] of faults) {
    const atlas = diagramAtlas({ topology, faults: [f] });
    for (let phi = -90; phi <= 90; phi++) {
      modulationLimit(atlas.faulted, phi, 0);
      evaluations++;
    }
  }
}, 3000);
console.log(`  = ${evaluations} exact limits, ${((atlasMs * 1000) / evaluations).toFixed(1)} µs per limit including the atlas build`);

// modulate: fast grid paths against the plain linear scan over all triangles (locateReference)
const { createModulator, locateReference, POLARITY_STRINGS } = await import('../packages/core/dist/index.js');
const N = 200000;
const refs = new Float64Array(2 * N);
const pols = new Int32Array(N);
let seed = 12345;
const rnd = () => ((seed = (seed * 1103515245 + 12345) >>> 0) / 2 ** 32);
for (let i = 0; i < N; i++) {
  const r = 1.15 * Math.sqrt(rnd());
  const th = 2 * Math.PI * rnd();
  refs[2 * i] = r * Math.cos(th);
  refs[2 * i + 1] = r * Math.sin(th);
  pols[i] = Math.floor(rnd() * 25);
}
for (const [label, faults] of [['healthy npc', []], ['npc a.outerUpper', ['a.outerUpper']], ['five-level leg', null]]) {
  const plan = faults === null
    ? planRemedial({ topology: JSON.parse((await import('node:fs')).readFileSync(new URL('../examples/five-level-leg.json', import.meta.url), 'utf8')) })
    : planRemedial({ topology: 'npc', faults });
  const mod = createModulator(plan);
  const out = new Float64Array(4);
  const names = POLARITY_STRINGS;
  const rate = (ms) => `${((N / ms) * 1000 / 1e6).toFixed(2)} M calls/s`;
  const into = time(`modulateInto (${label}), ${N} refs`, () => { for (let i = 0; i < N; i++) mod.modulateInto(refs[2 * i], refs[2 * i + 1], pols[i], out); }, 1000);
  const obj = time(`modulate (${label}), ${N} refs`, () => { for (let i = 0; i < N; i++) mod.modulate(refs[2 * i], refs[2 * i + 1], names[pols[i]]); }, 1000);
  const naive = time(`linear scan, all triangles (${label}), ${N} refs`, () => { for (let i = 0; i < N; i++) locateReference(plan.polarities[names[pols[i]]], refs[2 * i], refs[2 * i + 1]); }, 1000);
  console.log(`  ${label}: modulateInto ${rate(into)}, modulate ${rate(obj)}, linear scan ${rate(naive)}; speed-up ${(naive / into).toFixed(1)}x (into), ${(naive / obj).toFixed(1)}x (object)`);
}
