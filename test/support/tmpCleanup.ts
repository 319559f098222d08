import { readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

// The test suite leaves the temporary folder as it found it: every `hexsalvage-*` entry the run
// made there (test folders, worker files) is removed when the run ends, whatever a test did.
const mine = () => new Set(readdirSync(tmpdir()).filter((f) => f.startsWith('hexsalvage-')));

/**
 * Vitest global setup: notes the temporary folder's `hexsalvage-*` entries; the returned teardown
 * removes every one made since.
 *
 * @returns the teardown
 */
export default function setup(): () => void {
  const before = mine();
  return () => {
    for (const f of mine()) if (!before.has(f)) rmSync(join(tmpdir(), f), { recursive: true, force: true });
  };
}
