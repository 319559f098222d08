import { closeSync, constants, fstatSync, openSync, readSync, statSync } from 'node:fs';
import { HexsalvageInputError, type InputErrorCode } from '../shared/errors.js';
import { MAX_INPUT_BYTES, parseJsonText } from '../shared/parseJsonText.js';

export { MAX_INPUT_BYTES, MAX_INPUT_DEPTH } from '../shared/parseJsonText.js';

/**
 * Reads a JSON input file safely: a regular file only (no device, FIFO or folder: `/dev/zero` is
 * refused, not read), at most {@link MAX_INPUT_BYTES}, UTF-8 with an optional byte-order mark, nested
 * at most {@link MAX_INPUT_DEPTH} deep, and without duplicate keys in an object (JSON.parse would keep
 * the last one silently). Error messages name the file and the line and column, never its content.
 *
 * @param path - the file
 * @param shown - how the file is named in messages (as the user gave it)
 * @param code - error family for the messages
 * @returns the parsed document
 * @throws HexsalvageInputError on any of the above
 * @example
 * ```ts
 * readJsonFile('examples/five-level-leg.json', 'examples/five-level-leg.json', 'netlist');
 * ```
 */
export function readJsonFile(path: string, shown: string, code: InputErrorCode): unknown {
  const bad = (key: string, expected: string) => new HexsalvageInputError(code, shown, key, expected);
  let text: string;
  let fd: number | undefined;
  try {
    // a pipe would block the open itself: look first, then open without blocking and look again
    // (the file may have been swapped in between)
    if (!statSync(path).isFile()) throw bad('(file)', 'a regular file (not a device, pipe or folder)');
    fd = openSync(path, constants.O_RDONLY | constants.O_NONBLOCK);
    const st = fstatSync(fd);
    if (!st.isFile()) throw bad('(file)', 'a regular file (not a device, pipe or folder)');
    if (st.size > MAX_INPUT_BYTES) throw bad('(file)', `a file of at most ${MAX_INPUT_BYTES} bytes (it has ${st.size})`);
    const buf = Buffer.alloc(st.size);
    let got = 0;
    while (got < st.size) {
      const n = readSync(fd, buf, got, st.size - got, got);
      if (n === 0) break;
      got += n;
    }
    try {
      text = new TextDecoder('utf-8', { fatal: true }).decode(buf.subarray(0, got));
    } catch {
      throw bad('(file)', 'text in UTF-8 (the file holds bytes that are not)');
    }
  } catch (e) {
    if (e instanceof HexsalvageInputError) throw e;
    throw bad('(file)', `a readable file (${(e as NodeJS.ErrnoException).code ?? 'read failed'})`);
  } finally {
    if (fd !== undefined) closeSync(fd);
  }
  return parseJsonText(text, shown, code);
}
