import { writeFileSync, renameSync, mkdirSync } from 'node:fs';
import { dirname } from 'node:path';
import { HexsalvageInputError } from '@hexsalvage/core';

/** Where command output goes; tests pass their own. */
export interface CommandIO {
  readonly stdout: (text: string) => Promise<void>;
  readonly stderr: (text: string) => void;
}

/**
 * Writes to a stream and resolves once the data has been handed to the OS, so a large JSON
 * document on a pipe is complete before the process ends.
 *
 * @param stream - process.stdout or process.stderr
 * @param text - text to write
 * @returns a promise that resolves after the write callback
 * @example
 * ```ts
 * await writeAll(process.stdout, JSON.stringify(doc) + '\n');
 * ```
 */
export function writeAll(stream: NodeJS.WritableStream, text: string): Promise<void> {
  return new Promise((res, rej) => {
    stream.write(text, (err) => (err ? rej(err) : res()));
  });
}

/**
 * Replaces a file atomically: writes a temporary file beside it, then renames it over the target.
 *
 * @param path - target path
 * @param data - file contents
 * @throws HexsalvageInputError when the path cannot be written
 * @example
 * ```ts
 * writeFileAtomic('plan.json', JSON.stringify(plan));
 * ```
 */
export function writeFileAtomic(path: string, data: string | Uint8Array): void {
  const tmp = `${path}.${process.pid}.tmp`;
  try {
    mkdirSync(dirname(path), { recursive: true });
    writeFileSync(tmp, data);
    renameSync(tmp, path);
  } catch (e) {
    throw new HexsalvageInputError('usage', '--out', '--out', `a writable file path (${(e as NodeJS.ErrnoException).code ?? 'write failed'})`, path);
  }
}
