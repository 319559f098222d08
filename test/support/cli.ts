import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { main } from '../../packages/cli/src/main.js';

export const ROOT = fileURLToPath(new URL('../../', import.meta.url));
export const BIN = fileURLToPath(new URL('../../packages/cli/bin/hexsalvage.mjs', import.meta.url));

/** Runs the CLI in this process (fast; for large matrices of cases). */
export async function runInProcess(argv: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  let stdout = '';
  let stderr = '';
  const code = await main(argv, {
    stdout: async (t) => {
      stdout += t;
    },
    stderr: (t) => {
      stderr += t;
    },
  });
  return { code, stdout, stderr };
}

/** Runs the built launcher as a user would (needs `pnpm build`). */
export function runBin(argv: string[], cwd = ROOT): { code: number; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [BIN, ...argv], { cwd, encoding: 'utf8', maxBuffer: 256 * 1024 * 1024 });
  return { code: r.status ?? -1, stdout: r.stdout, stderr: r.stderr };
}
