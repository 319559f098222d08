import fc from 'fast-check';

/**
 * fast-check settings for every property test: a fixed seed in CI (HEXSALVAGE_SEED or 20261201),
 * a fresh one elsewhere; fast-check prints the seed and path of any failure, which reproduces it.
 */
export const FC_SEED = Number(process.env.HEXSALVAGE_SEED ?? (process.env.CI ? 20261201 : Date.now() % 2 ** 31));

/** Parameters for fc.assert: seeded, with a run count that fits a 2-core CI machine. */
export function fcParams(numRuns = 100): fc.Parameters<unknown> {
  return { seed: FC_SEED, numRuns, verbose: 1 };
}

export { fc };
