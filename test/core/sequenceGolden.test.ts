import { readFileSync, writeFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import * as core from '@hexsalvage/core/internal';
// @ts-expect-error a plain module shared with the script that wrote the golden file
import { sequenceDigest } from '../support/sequenceDigest.mjs';

// The sequence search ranks every order and realisation combination of a triangle (line-device
// changes, gate changes, level jumps, pattern preference, then search order). Its inner loop is
// written for speed (integer level positions, the first step's rule tested before the third
// vertex is gone through, the rank compared as numbers); this file was written by the plain form
// it replaced, over built-in legs healthy and faulted under each level-step rule and the
// five-level example, and the search must still choose exactly the same sequences. Regenerate with
// UPDATE_GOLDEN=1 pnpm test (as every golden file), then review the diff like code.
describe('switching sequences (golden file)', () => {
  it('chooses the same order, realisations and patterns for every triangle of every polarity', () => {
    const five = JSON.parse(readFileSync(new URL('../../examples/five-level-leg.json', import.meta.url), 'utf8'));
    const url = new URL('./golden/sequences.txt', import.meta.url);
    const digest = (sequenceDigest as (c: typeof core, leg: unknown) => string)(core, five);
    if (process.env.UPDATE_GOLDEN === '1') writeFileSync(url, digest);
    const golden = readFileSync(url, 'utf8');
    const want = golden.split('\n');
    const got = digest.split('\n');
    expect(got.length).toBe(want.length);
    // line by line, so that a difference names its case and polarity
    got.forEach((line, i) => expect(line).toBe(want[i]));
  });
});
