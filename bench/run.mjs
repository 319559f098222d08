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
