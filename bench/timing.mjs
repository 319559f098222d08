// Timing helpers shared by the benchmarks (`pnpm bench`).

/**
 * Milliseconds per call of `fn`: one warm-up call, then calls until `minMs` have passed.
 *
 * @param fn - the work
 * @param minMs - how long to keep calling
 * @returns mean milliseconds per call, and the number of calls timed
 */
export function msPerRun(fn, minMs) {
  fn();
  let n = 0;
  const t0 = performance.now();
  let t = t0;
  while (t - t0 < minMs) {
    fn();
    n++;
    t = performance.now();
  }
  return { ms: (t - t0) / n, runs: n };
}

/** The median of a list of numbers (the upper one of the middle two for an even count). */
export function medianOf(xs) {
  return [...xs].sort((a, b) => a - b)[xs.length >> 1];
}
