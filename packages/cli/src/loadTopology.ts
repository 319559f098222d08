import { isAbsolute, relative, resolve } from 'node:path';
import { existsSync } from 'node:fs';
import { BUILTIN_TOPOLOGIES, HexsalvageInputError, isBuiltinTopology, parseNetlist, type LegNetlist } from '@hexsalvage/core';
import { readJsonFile } from './readJsonFile.js';

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
  if (confine) {
    const rel = relative(resolve(baseDir), path);
    if (rel === '' || rel.startsWith('..') || isAbsolute(rel)) {
      throw new HexsalvageInputError('topology', 'topology', 'topology', `a built-in leg or a netlist file in the claims file's folder or below`, value);
    }
  }
  if (!existsSync(path)) {
    throw new HexsalvageInputError('topology', 'topology', 'topology', `a built-in leg (${BUILTIN_TOPOLOGIES.join(', ')}) or an existing netlist file`, value);
  }
  return parseNetlist(readJsonFile(path, value, 'netlist'), value);
}
