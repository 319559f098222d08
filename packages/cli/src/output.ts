import { randomBytes } from 'node:crypto';
import { chmodSync, closeSync, fsyncSync, lstatSync, openSync, renameSync, rmSync, statSync, writeSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import { HexsalvageInputError } from '@hexsalvage/core/errors';

/** Where command output goes; tests pass their own. */
export interface CommandIO {
  readonly stdout: (text: string) => Promise<void>;
  readonly stderr: (text: string) => void;
  /** Whether stderr is a terminal (progress lines are drawn only there). Default false. */
  readonly stderrIsTTY?: boolean;
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
 * Replaces a file atomically and safely.
 *
 * - The folder must exist (a typo must not create trees) and the target, if it exists, must be a
 *   regular file (a device, folder or socket is refused); a replaced file keeps its mode.
 * - The data goes to a new file with a random name in the target's folder, created exclusively
 *   (`wx`: it never follows or reuses a planted file or link), flushed to disk (fsync), then renamed
 *   over the target. On any error the temporary file is removed. The write is synchronous, so a
 *   signal is handled only after it has finished or been cleaned up; only SIGKILL during the write
 *   can leave a `.<name>.<random>.tmp` file behind.
 *
 * @param path - target path
 * @param data - file contents
 * @throws HexsalvageInputError when the path cannot be written, naming why
 * @example
 * ```ts
 * writeFileAtomic('plan.json', JSON.stringify(plan));
 * ```
 */
export function writeFileAtomic(path: string, data: string | Uint8Array): void {
  const bad = (expected: string) => new HexsalvageInputError('usage', 'command line', '--out', expected, path);
  const dir = dirname(resolve(path));
  let dirStat;
  try {
    dirStat = statSync(dir);
  } catch {
    throw bad(`a file in an existing folder (folder ${JSON.stringify(dir)} does not exist; create it first)`);
  }
  if (!dirStat.isDirectory()) throw bad(`a file in a folder (${JSON.stringify(dir)} is not a folder)`);
  let mode: number | undefined;
  try {
    const st = lstatSync(path);
    if (!st.isFile()) throw bad('a regular file to create or replace (the target exists and is not a regular file)');
    mode = st.mode & 0o7777;
  } catch (e) {
    if (e instanceof HexsalvageInputError) throw e;
    if ((e as NodeJS.ErrnoException).code !== 'ENOENT') throw bad(`a writable file path (${(e as NodeJS.ErrnoException).code ?? 'not readable'})`);
  }
  const tmp = join(dir, `.${basename(path)}.${randomBytes(6).toString('hex')}.tmp`);
  let fd: number | undefined;
  try {
    fd = openSync(tmp, 'wx', mode ?? 0o666);
    writeSync(fd, typeof data === 'string' ? Buffer.from(data, 'utf8') : data);
    fsyncSync(fd);
    closeSync(fd);
    fd = undefined;
    if (mode !== undefined) chmodSync(tmp, mode);
    renameSync(tmp, path);
  } catch (e) {
    if (fd !== undefined) {
      try {
        closeSync(fd);
      } catch {
        // already closed or never opened: nothing to release
      }
    }
    rmSync(tmp, { force: true });
    throw bad(`a writable file path (${(e as NodeJS.ErrnoException).code ?? 'write failed'})`);
  }
}

/**
 * The stdout sink of the launcher: resolves once the text is handed to the OS; a reader that went
 * away (EPIPE, `| head`) ends the output quietly, any other failure (a full device) rejects with a
 * one-line {@link OutputError}.
 *
 * @param stream - process.stdout
 * @returns the `stdout` function of a {@link CommandIO}
 * @example
 * ```ts
 * const io = { stdout: stdoutSink(process.stdout), stderr: (t) => process.stderr.write(t) };
 * ```
 */
export function stdoutSink(stream: NodeJS.WriteStream): (text: string) => Promise<void> {
  let closed = false;
  // without a listener a late EPIPE would surface as an unhandled 'error' event with a stack trace
  stream.on('error', () => {});
  return (text) => new Promise((res, rej) => {
    if (closed) {
      res();
      return;
    }
    stream.write(text, (err) => {
      if (!err) res();
      else if ((err as NodeJS.ErrnoException).code === 'EPIPE') {
        closed = true;
        res();
      } else rej(new OutputError((err as NodeJS.ErrnoException).code ?? err.message));
    });
  });
}

/** Standard output could not be written (other than a closed pipe). */
export class OutputError extends Error {
  /**
   * @param code - the system error code, e.g. `ENOSPC`
   */
  constructor(code: string) {
    super(`cannot write to standard output (${code}${code === 'ENOSPC' ? ': no space left on device' : ''})`);
    this.name = 'OutputError';
  }
}
