import { isAbsolute, relative, resolve, sep } from 'node:path';
import { existsSync, realpathSync } from 'node:fs';
import { BUILTIN_TOPOLOGIES, HexsalvageInputError, isBuiltinTopology, parseNetlist, type LegNetlist } from '@hexsalvage/core';
import { readJsonFile } from '@hexsalvage/core/node';

/**
 * Reads a `--topology` value: a built-in id, or a netlist file path (relative to `baseDir`), read
 * with {@link readJsonFile} (regular files of at most 1 MiB).
 *
 * @param value - built-in id or path
 * @param baseDir - directory relative paths start from (default: current directory)
 * @param confine - refuse paths that leave `baseDir` (claims files name netlists beside them)
 * @returns the built-in id (string) or the parsed, validated netlist
 * @throws HexsalvageInputError naming the file and key on unreadable, non-JSON or invalid netlists
 * @example
 * ```ts
 * loadTopology('examples/five-level-leg.json');
 * ```
 */
export function loadTopology(value: string, baseDir = process.cwd(), confine = false): string | LegNetlist {
  if (isBuiltinTopology(value)) return value;
  const path = resolve(baseDir, value);
  if (!existsSync(path)) {
    throw new HexsalvageInputError('topology', 'topology', 'topology', `a built-in leg (${BUILTIN_TOPOLOGIES.join(', ')}) or an existing netlist file`, value);
  }
  if (confine) confined(value, baseDir, 'topology', 'a built-in leg or a netlist file in the folder of the file that names it, or below');
  return parseNetlist(readJsonFile(path, value, 'netlist'), value);
}

/**
 * A path named inside a file (a claims file's netlist, a scenario's netlist or claims file), kept
 * inside that file's folder: after every symbolic link is resolved, the file must lie in the folder
 * or below it (a link out of it, an absolute path or `..` is refused).
 *
 * @param value - the path as written
 * @param baseDir - the folder of the file that names it
 * @param key - the key that holds it, for the message
 * @param expected - what is accepted, for the message
 * @returns the real path
 * @throws HexsalvageInputError when it leaves the folder or does not exist
 * @example
 * ```ts
 * confined('legs/five.json', 'examples', 'topology', 'a netlist file in the folder');
 * ```
 */
export function confined(value: string, baseDir: string, key: string, expected: string): string {
  let real: string;
  let root: string;
  try {
    real = realpathSync(resolve(baseDir, value));
    root = realpathSync(resolve(baseDir));
  } catch {
    throw new HexsalvageInputError('topology', key, key, expected, value);
  }
  const rel = relative(root, real);
  if (rel === '' || rel === '..' || rel.startsWith(`..${sep}`) || isAbsolute(rel)) throw new HexsalvageInputError('topology', key, key, expected, value);
  return real;
}
