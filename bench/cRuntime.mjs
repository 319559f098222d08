// The exported C header's runtime per switching period beside the header's own triangle locator,
// compiled with the machine's C compiler (-O2): what firmware pays, as run.mjs measures the
// TypeScript runtime beside modulateInto. One leg per line; skipped without a C compiler.
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { exportC, planRemedial, switchingTable } from '../packages/core/dist/internal.js';

// A rotating reference at 90 % of mMax, STEPS updates per fundamental period, currents lagging by
// 30°, the polarity from their signs; each timing is the median of nine passes over N updates.
const DRIVER = String.raw`
#define _POSIX_C_SOURCE 199309L
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <time.h>
#include "bench_table.h"
#define N 200000
static double a[N], b[N], ia[N], ib[N], ic[N], each[N];
static int q[N];
static double now(void) { struct timespec t; clock_gettime(CLOCK_MONOTONIC, &t); return t.tv_sec * 1e9 + t.tv_nsec; }
static int by(const void *x, const void *y) { double d = *(const double *)x - *(const double *)y; return d < 0 ? -1 : d > 0; }
int main(int argc, char **argv) {
  double m = atof(argv[1]), steps = atof(argv[2]), pi = 3.14159265358979323846, t[2][9], sink = 0;
  int i, r, w;
  hs_runtime rt;
  hs_output out;
  (void)argc;
  for (i = 0; i < N; i++) {
    double th = 2 * pi * i / steps;
    a[i] = m * cos(th); b[i] = m * sin(th);
    ia[i] = cos(th - pi / 6); ib[i] = cos(th - pi / 6 - 2 * pi / 3); ic[i] = cos(th - pi / 6 - 4 * pi / 3);
    q[i] = hs_polarity_index(ia[i] > 0 ? 1 : -1, ib[i] > 0 ? 1 : -1, ic[i] > 0 ? 1 : -1);
  }
  hs_runtime_init(&rt, 1, 1, 0.0, 0.02);
  for (r = 0; r < 9; r++) {
    double t0 = now(), dwell[3];
    int clamped;
    for (i = 0; i < N; i++) sink += hs_runtime_period(&rt, q[i], q[i], a[i], b[i], ia[i], ib[i], ic[i], 0.0, &out) + out.duration[0];
    t[0][r] = (now() - t0) / N;
    t0 = now();
    for (i = 0; i < N; i++) sink += hs_locate(q[i], a[i], b[i], dwell, &clamped) + dwell[0];
    t[1][r] = (now() - t0) / N;
  }
  for (w = 0; w < 2; w++) qsort(t[w], 9, sizeof(double), by);
  /* the slow calls (a new triangle or context): each call timed alone, the clock's own cost
   * included; the 99.9th percentile (the maximum is the operating system's, not the header's) */
  for (i = 0; i < N; i++) {
    double t0 = now();
    sink += hs_runtime_period(&rt, q[i], q[i], a[i], b[i], ia[i], ib[i], ic[i], 0.0, &out);
    each[i] = now() - t0;
  }
  qsort(each, N, sizeof(double), by);
  printf("%.1f %.1f %.0f %g\n", t[0][4], t[1][4], each[N - N / 1000], sink > 0 ? 0.0 : 1.0);
  return 0;
}
`;

const cc = ['cc', 'gcc', 'clang'].find((c) => spawnSync(c, ['--version']).status === 0);
if (!cc) {
  console.log('  C runtime: no C compiler on this machine, skipped');
} else {
  const five = JSON.parse(readFileSync(new URL('../examples/five-level-leg.json', import.meta.url), 'utf8'));
  for (const [label, topology, faults] of [
    ['healthy npc', 'npc', []],
    ['npc a.outerUpper', 'npc', ['a.outerUpper']],
    ['five-level leg', five, []],
  ]) {
    const dir = mkdtempSync(join(tmpdir(), 'hexsalvage-bench-'));
    try {
      const table = switchingTable({ topology, faults });
      const m = 0.9 * Math.max(planRemedial({ topology, faults, remedies: false }).mMax, 0.1);
      writeFileSync(join(dir, 'bench_table.h'), exportC(table, { prefix: 'hs' }));
      writeFileSync(join(dir, 'bench.c'), DRIVER);
      execFileSync(cc, ['-std=c99', '-O2', '-o', join(dir, 'bench'), join(dir, 'bench.c'), '-lm']);
      for (const steps of [2000, 200]) {
        const [rt, loc, worst] = execFileSync(join(dir, 'bench'), [String(m), String(steps)])
          .toString()
          .trim()
          .split(' ')
          .map(Number);
        console.log(
          `  ${label}, C header (${cc} -O2), ${steps} periods per fundamental: runtime ${rt.toFixed(1)} ns per switching period (99.9th percentile of single calls ${worst.toFixed(0)} ns), locate ${loc.toFixed(1)} ns; ${(rt / loc).toFixed(2)}x`,
        );
      }
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }
}
