import { readFileSync, writeFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
// @ts-expect-error a plain module shared with `pnpm api`, which writes the documents
import { apiReport, ENTRIES } from '../../scripts/api-report.mjs';
import { ROOT } from '../support/cli.js';

// The public surface as reviewed documents (docs/api/*.md): regenerated from the sources and
// compared, so that a change to what the packages export shows in review. UPDATE_GOLDEN=1 (or
// `pnpm api`) rewrites them.
describe('API report', () => {
  for (const [name, file] of ENTRIES as [string, string][]) {
    it(`matches docs/api for ${name}`, () => {
      const path = `${ROOT}docs/api/${name.replace(/^@hexsalvage\//, '').replace('/', '-')}.md`;
      const now = (apiReport as (n: string, f: string) => string)(name, file);
      if (process.env.UPDATE_GOLDEN === '1') writeFileSync(path, now);
      expect(now).toBe(readFileSync(path, 'utf8'));
    }, 60000);
  }
});
