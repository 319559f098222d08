import { builtinLeg, BUILTIN_TOPOLOGIES, isBuiltinTopology } from './builtinLegs.js';
import { HexsalvageInputError } from '../shared/errors.js';
import type { LegNetlist } from './netlist.js';
import { parseNetlist } from './parseNetlist.js';

/**
 * Turns a topology option (a built-in id or a netlist object) into a validated leg.
 *
 * @param topology - a built-in id such as `npc`, or a netlist object in the file format
 * @param input - name used in error messages (default `topology`)
 * @returns the leg netlist
 * @example
 * ```ts
 * resolveTopology('tnpc').devices.length; // 4
 * ```
 */
export function resolveTopology(topology: unknown, input = 'topology'): LegNetlist {
  if (typeof topology === 'string') {
    if (isBuiltinTopology(topology)) return builtinLeg(topology);
    // a string that is not a built-in id is most likely a file path: the library takes objects (it
    // runs in browsers too), so say how to read a file
    throw new HexsalvageInputError(
      'topology',
      input,
      'topology',
      `a built-in leg (${BUILTIN_TOPOLOGIES.join(', ')}) or a netlist object; to use a netlist file, read it first, e.g. in Node with loadNetlistFile(path) from '@hexsalvage/core/node'`,
      topology,
    );
  }
  return parseNetlist(topology, input);
}
