import type { LegNetlist } from '../netlist/netlist.js';
import { parseNetlist } from '../netlist/parseNetlist.js';
import { readJsonFile } from './readJsonFile.js';

/**
 * Reads and validates a netlist file, for Node: the library's entry points take a built-in id or
 * a netlist object, never a path (they run in browsers too), so a file is read here first.
 *
 * @param path - the netlist file (JSON, the format of docs/leg-model.md; at most 1 MiB)
 * @returns the validated netlist, to pass as `topology`
 * @throws HexsalvageInputError naming the file and the key on an unreadable, non-JSON or invalid netlist
 * @example
 * ```ts
 * import { planRemedial } from '@hexsalvage/core';
 * import { loadNetlistFile } from '@hexsalvage/core/node';
 * planRemedial({ topology: loadNetlistFile('examples/five-level-leg.json'), faults: ['a.s1'] }).mMax;
 * ```
 */
export function loadNetlistFile(path: string): LegNetlist {
  return parseNetlist(readJsonFile(path, path, 'netlist'), path);
}
