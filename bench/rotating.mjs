// The rotating-reference goals of the modulator, one leg per process (`node bench/rotating.mjs LEG`):
// run.mjs starts one per leg, so that the engine's feedback from one leg's loops does not shape the
// next leg's (in one process the same call sites see several modulators and may stop inlining).
import { readFileSync } from 'node:fs';
import { createModulator, createRuntime, planRemedial, polarityAt, POLARITY_STRINGS, switchingTable } from '../packages/core/dist/internal.js';
import { leanScan } from './leanScan.mjs';
import { medianOf, msPerRun } from './timing.mjs';

const label = process.argv[2];
const topology = label === 'five-level leg' ? JSON.parse(readFileSync(new URL('../examples/five-level-leg.json', import.meta.url), 'utf8')) : 'npc';
const faults = label === 'npc a.outerUpper' ? ['a.outerUpper'] : [];
const plan = planRemedial({ topology, faults });
const N = 200000;
const out = new Float64Array(4);
const names = POLARITY_STRINGS;
// the plain allocation-free scan (bench/leanScan.mjs)
const scan = leanScan(plan, out);

// N updates of a reference rotating at 90 % of mMax, `steps` per fundamental period: α, β pairs,
// the polarity following the currents (φ = 30°) and the currents themselves (peak 1)
function rotatingReference(steps) {
  const ref = new Float64Array(2 * N);
  const pol = new Int32Array(N);
  const cur = new Float64Array(3 * N);
  for (let i = 0; i < N; i++) {
    const th = (2 * Math.PI * i) / steps;
    const m = 0.9 * Math.max(plan.mMax, 0.1);
    ref[2 * i] = m * Math.cos(th);
    ref[2 * i + 1] = m * Math.sin(th);
    pol[i] = POLARITY_STRINGS.indexOf(polarityAt((th * 180) / Math.PI, 30, 0));
    for (let k = 0; k < 3; k++) cur[3 * i + k] = Math.cos(th - Math.PI / 6 - (k * 2 * Math.PI) / 3);
  }
  return { ref, pol, cur };
}

// one small angle step per call
const { ref: rot, pol: rotPol } = rotatingReference(2000);
const mod = createModulator(plan);
const time = (fn, minMs = 600) => msPerRun(fn, minMs).ms;
// interleaved, median of five rounds each
const into = [];
const obj = [];
const lean = [];
for (let r = 0; r < 5; r++) {
  into.push(
    time(() => {
      for (let i = 0; i < N; i++) mod.modulateInto(rot[2 * i], rot[2 * i + 1], rotPol[i], out);
    }),
  );
  obj.push(
    time(() => {
      for (let i = 0; i < N; i++) mod.modulate(rot[2 * i], rot[2 * i + 1], names[rotPol[i]]);
    }),
  );
  lean.push(
    time(() => {
      for (let i = 0; i < N; i++) scan(rot[2 * i], rot[2 * i + 1], rotPol[i]);
    }),
  );
}
const med = medianOf;
const ns = (ms) => ((ms * 1e6) / N).toFixed(1);
console.log(
  `  ${label}, rotating: modulateInto ${ns(med(into))} ns, modulate ${ns(med(obj))} ns, lean scan ${ns(med(lean))} ns per call; modulateInto is ${(med(lean) / med(into)).toFixed(2)}x the lean linear scan; modulate costs ${(med(obj) / med(into)).toFixed(2)}x modulateInto`,
);

// The runtime per switching period (goal: at most 3x modulateInto): one period per call, measured
// currents (30° lag), midpoint error 0; modulateInto on the table's modulator over the same
// references. Two rates: 2000 periods per fundamental (the reference barely moves) and 200 (a
// 10 kHz carrier at 50 Hz: the triangle and the context change ten times as often).
{
  const table = switchingTable({ topology, faults });
  const tmod = createModulator(table);
  const rt = createRuntime(table);
  const buf = rt.output();
  for (const steps of [2000, 200]) {
    const { ref, pol, cur } = rotatingReference(steps);
    const tInto = [];
    const tRt = [];
    for (let r = 0; r < 5; r++) {
      tInto.push(
        time(() => {
          for (let i = 0; i < N; i++) tmod.modulateInto(ref[2 * i], ref[2 * i + 1], pol[i], out);
        }),
      );
      tRt.push(
        time(() => {
          for (let i = 0; i < N; i++) rt.period(ref[2 * i], ref[2 * i + 1], pol[i], cur[3 * i], cur[3 * i + 1], cur[3 * i + 2], 0, buf);
        }),
      );
    }
    console.log(
      `  ${label}, rotating, ${steps} periods per fundamental: runtime ${ns(med(tRt))} ns per switching period, modulateInto ${ns(med(tInto))} ns; the runtime costs ${(med(tRt) / med(tInto)).toFixed(2)}x modulateInto (goal: at most 3x)`,
    );
  }
}
