// modulateInto against the plain allocation-free scan (bench/leanScan.mjs) on every single fault of
// one leg (`node bench/modulatorSweep.mjs LEG`; run.mjs starts one process per leg): a rotating
// reference at 90 % of mMax, φ = 30°, the polarity following the currents. Goal (issue "speed"):
// modulateInto at least 1.0x the scan on every built-in single fault. Cases that cannot run
// (mMax = 0) have nothing to modulate and are left out.
import { readFileSync } from 'node:fs';
import { createModulator, expandElements, FAULT_MODES, planRemedial, polarityAt, POLARITY_STRINGS, resolveTopology } from '../packages/core/dist/internal.js';
import { leanScan } from './leanScan.mjs';
import { medianOf, msPerRun } from './timing.mjs';

const arg = process.argv[2] ?? 'npc';
const topology = arg.endsWith('.json') ? JSON.parse(readFileSync(arg, 'utf8')) : arg;
const N = 20000;
const out = new Float64Array(4);
const time = (fn, minMs = 60) => msPerRun(fn, minMs).ms;
const med = medianOf;
const rows = [];
for (const e of expandElements(resolveTopology(topology)).map((x) => x.id)) {
  for (const mode of FAULT_MODES) {
    const fault = `a.${e}:${mode}`;
    const plan = planRemedial({ topology, faults: [fault], loadAngleDeg: 30, remedies: false });
    if (plan.mMax <= 0) continue;
    const rot = new Float64Array(2 * N);
    const pol = new Int32Array(N);
    for (let i = 0; i < N; i++) {
      const th = (2 * Math.PI * i) / 2000;
      rot[2 * i] = 0.9 * plan.mMax * Math.cos(th);
      rot[2 * i + 1] = 0.9 * plan.mMax * Math.sin(th);
      pol[i] = POLARITY_STRINGS.indexOf(polarityAt((th * 180) / Math.PI, 30, 0));
    }
    const mod = createModulator(plan);
    const scan = leanScan(plan, out);
    // and references anywhere inside the limit, in random order (every call searches)
    let seed = 7;
    const rnd = () => (seed = (seed * 1103515245 + 12345) >>> 0) / 2 ** 32;
    const jump = new Float64Array(2 * N);
    const jumpPol = new Int32Array(N);
    for (let i = 0; i < N; i++) {
      const r = 0.98 * plan.mMax * Math.sqrt(rnd());
      const th = 2 * Math.PI * rnd();
      jump[2 * i] = r * Math.cos(th);
      jump[2 * i + 1] = r * Math.sin(th);
      jumpPol[i] = POLARITY_STRINGS.indexOf(polarityAt((th * 180) / Math.PI, 30, 0));
    }
    const into = [];
    const lean = [];
    const intoJ = [];
    const leanJ = [];
    for (let r = 0; r < 5; r++) {
      into.push(
        time(() => {
          for (let i = 0; i < N; i++) mod.modulateInto(rot[2 * i], rot[2 * i + 1], pol[i], out);
        }),
      );
      lean.push(
        time(() => {
          for (let i = 0; i < N; i++) scan(rot[2 * i], rot[2 * i + 1], pol[i]);
        }),
      );
      intoJ.push(
        time(() => {
          for (let i = 0; i < N; i++) mod.modulateInto(jump[2 * i], jump[2 * i + 1], jumpPol[i], out);
        }),
      );
      leanJ.push(
        time(() => {
          for (let i = 0; i < N; i++) scan(jump[2 * i], jump[2 * i + 1], jumpPol[i]);
        }),
      );
    }
    const triangles = Math.max(...POLARITY_STRINGS.map((p) => plan.polarities[p].triangles.length));
    rows.push({ fault, triangles, ratio: med(lean) / med(into), into: (med(into) * 1e6) / N, lean: (med(lean) * 1e6) / N, jumpRatio: med(leanJ) / med(intoJ) });
  }
}
const name = typeof topology === 'string' ? topology : topology.name;
if (rows.length === 0) {
  console.log(`  ${name}: no single fault leaves a voltage to modulate (every one cannot run)`);
  process.exit(0);
}
const worst = rows.reduce((a, b) => (b.ratio < a.ratio ? b : a));
const worstJ = rows.reduce((a, b) => (b.jumpRatio < a.jumpRatio ? b : a));
console.log(
  `  ${name}: modulateInto / lean scan over ${rows.length} single faults (rotating, 90 % of mMax): worst ${worst.ratio.toFixed(2)}x (${worst.fault}, ${worst.triangles} triangles, ${worst.into.toFixed(1)} vs ${worst.lean.toFixed(1)} ns), median ${med(rows.map((r) => r.ratio)).toFixed(2)}x (goal ≥ 1.0); references in random order: worst ${worstJ.jumpRatio.toFixed(2)}x (${worstJ.fault}, ${worstJ.triangles} triangles)`,
);
if (process.env.HS_BENCH_ROWS)
  for (const r of rows)
    console.log(
      `    ${r.fault.padEnd(28)} ${String(r.triangles).padStart(4)} triangles  ${r.into.toFixed(1).padStart(6)} ns  scan ${r.lean.toFixed(1).padStart(6)} ns  ${r.ratio.toFixed(2)}x  random order ${r.jumpRatio.toFixed(2)}x`,
    );
