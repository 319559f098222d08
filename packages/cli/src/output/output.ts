import { randomBytes } from 'node:crypto';
import { chmodSync, closeSync, fsyncSync, lstatSync, openSync, readFileSync, readlinkSync, renameSync, rmSync, statSync, writeSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import { constants as osConstants } from 'node:os';
import { HexsalvageInputError, plainText } from '@hexsalvage/core/errors';

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

/** Bytes written between two turns of the event loop (a termination signal is handled at each). */
const CHUNK = Number(process.env.HEXSALVAGE_WRITE_CHUNK ?? 1024 * 1024) || 1024 * 1024;
/** Test hook: milliseconds to wait between chunks (0 in use), so a test can signal mid-write. */
const CHUNK_DELAY_MS = Number(process.env.HEXSALVAGE_WRITE_DELAY_MS ?? 0) || 0;

// Temporary files being written, and the termination signal that arrived meanwhile (if any).
const pending = new Set<string>();
let interrupted: NodeJS.Signals | null = null;
const SIGNALS: readonly NodeJS.Signals[] = ['SIGTERM', 'SIGINT', 'SIGHUP'];
const onSignal = (sig: NodeJS.Signals) => {
  interrupted = sig;
};

/**
 * Replaces a file atomically and safely: it is written whole or not at all.
 *
 * - The folder must exist (a typo must not create trees) and the target, if it exists, must be a
 *   regular file (a device, folder or socket is refused); a replaced file keeps its mode.
 * - The data goes to a new file with a random name in the target's folder, created exclusively
 *   (`wx`: it never follows or reuses a planted file or link), written in a loop until every byte is
 *   down (a short write is continued, a failed one stops it), flushed to disk (fsync), then renamed
 *   over the target.
 * - On any error (a full disk, a file-size limit), and on SIGTERM, SIGINT or SIGHUP during the
 *   write, the temporary file is removed and the old file stays as it was; the command then ends
 *   with a message (exit 74, or 128 + the signal's number).
 *
 * @param path - target path
 * @param data - file contents
 * @throws HexsalvageInputError when the path cannot be written to; OutputError when the write fails
 * @example
 * ```ts
 * await writeFileAtomic('plan.json', JSON.stringify(plan));
 * ```
 */
export async function writeFileAtomic(path: string, data: string | Uint8Array): Promise<void> {
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
  const bytes = typeof data === 'string' ? Buffer.from(data, 'utf8') : data;
  if (pending.size === 0) for (const s of SIGNALS) process.on(s, onSignal);
  pending.add(tmp);
  let fd: number | undefined;
  try {
    fd = openSync(tmp, 'wx', mode ?? 0o666);
    let off = 0;
    while (off < bytes.length) {
      const n = writeSync(fd, bytes, off, Math.min(CHUNK, bytes.length - off));
      if (n <= 0) throw Object.assign(new Error('no progress'), { code: 'EIO' });
      off += n;
      // a turn of the event loop per chunk: a termination signal is seen before the rename
      if (off < bytes.length) await new Promise((r) => (CHUNK_DELAY_MS > 0 ? setTimeout(r, CHUNK_DELAY_MS) : setImmediate(r)));
      if (interrupted) throw new Interrupted(interrupted);
    }
    fsyncSync(fd);
    closeSync(fd);
    fd = undefined;
    if (interrupted) throw new Interrupted(interrupted);
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
    if (e instanceof Interrupted) {
      process.stderr.write(`hexsalvage: interrupted by ${e.signal}: ${plainText(path, 200)} not written (the old file, if any, is unchanged)\n`);
      process.exit(128 + (osConstants.signals[e.signal] ?? 15));
    }
    const code = (e as NodeJS.ErrnoException).code ?? 'write failed';
    throw new OutputError(
      code,
      `cannot write ${plainText(path, 200)} (${code}${REASONS[code] ? `: ${REASONS[code]}` : ''}); nothing was written there (the old file, if any, is unchanged)`,
    );
  } finally {
    pending.delete(tmp);
    if (pending.size === 0) {
      for (const s of SIGNALS) process.off(s, onSignal);
      // a signal that came after the last check: act on it now, as its default would have
      if (interrupted) {
        const sig = interrupted;
        interrupted = null;
        process.kill(process.pid, sig);
      }
    }
  }
}

const REASONS: Readonly<Record<string, string>> = {
  ENOSPC: 'no space left on device',
  EFBIG: 'file too large for this file system or limit',
  EDQUOT: 'disk quota exceeded',
  EIO: 'input/output error',
};

/** A termination signal arrived during a write. */
class Interrupted extends Error {
  constructor(readonly signal: NodeJS.Signals) {
    super(signal);
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
  return (text) =>
    new Promise((res, rej) => {
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

/** An output could not be written: standard output (other than a closed pipe) or a file. */
export class OutputError extends Error {
  /**
   * @param code - the system error code, e.g. `ENOSPC`
   * @param message - the one-line message (default: about standard output)
   */
  constructor(
    readonly code: string,
    message?: string,
  ) {
    super(message ?? `cannot write to standard output (${code}${REASONS[code] ? `: ${REASONS[code]}` : ''})`);
    this.name = 'OutputError';
  }
}

/**
 * Whether standard output was closed when the process started (`>&-`): Node then opens
 * `/dev/null` on it read-write, where a shell's `> /dev/null` opens it write-only, so on Linux the
 * access mode tells the two apart. Elsewhere the answer is false.
 *
 * @returns true when nothing the command prints could be read
 * @example
 * ```ts
 * if (stdoutClosed()) process.exitCode = 74;
 * ```
 */
export function stdoutClosed(): boolean {
  try {
    if (readlinkSync('/proc/self/fd/1') !== '/dev/null') return false;
    const flags = /^flags:\s*([0-7]+)/m.exec(readFileSync('/proc/self/fdinfo/1', 'utf8'));
    return flags !== null && (Number.parseInt(flags[1] as string, 8) & 3) === 2;
  } catch {
    return false;
  }
}
