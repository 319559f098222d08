import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { BUILTIN_TOPOLOGIES, HexsalvageInputError, isBuiltinTopology, parseNetlist, type LegNetlist } from '@hexsalvage/core';

/**
 * Reads a `--topology` value: a built-in id, or a netlist file path (relative to `baseDir`).
 *
 * @param value - built-in id or path
 * @param baseDir - directory relative paths start from (default: current directory)
 * @returns the built-in id (string) or the parsed, validated netlist
 * @throws HexsalvageInputError naming the file and key on unreadable, non-JSON or invalid netlists
 * @example
 * ```ts
 * loadTopology('examples/five-level-leg.json');
 * ```
 */
export function loadTopology(value: string, baseDir = process.cwd()): string | LegNetlist {
  if (isBuiltinTopology(value)) return value;
  const path = resolve(baseDir, value);
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch {
    throw new HexsalvageInputError('topology', '--topology', 'topology', `a built-in leg (${BUILTIN_TOPOLOGIES.join(', ')}) or a readable netlist file`, value);
  }
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch (e) {
    throw new HexsalvageInputError('netlist', value, '(document)', `valid JSON (${(e as Error).message.split('\n')[0]})`);
  }
  return parseNetlist(doc, value);
}
