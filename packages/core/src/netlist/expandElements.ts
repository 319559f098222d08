import type { LegElement, LegNetlist } from './netlist.js';

/**
 * Expands the devices of a leg into conducting elements (channels and diodes).
 *
 * @param leg - a validated leg netlist
 * @returns elements in netlist order, each device's antiparallel diode right after it
 * @example
 * ```ts
 * expandElements(builtinLeg('two-level')).map((e) => e.id);
 * // ['upper', 'upper.diode', 'lower', 'lower.diode']
 * ```
 */
export function expandElements(leg: LegNetlist): LegElement[] {
  const out: LegElement[] = [];
  for (const d of leg.devices) {
    const rating = d.rating === undefined ? {} : { rating: d.rating };
    out.push({ id: d.id, kind: d.kind, from: d.from, to: d.to, device: d.id, gated: d.kind !== 'diode', ...rating });
    if (d.antiparallelDiode && d.kind !== 'diode') {
      out.push({ id: `${d.id}.diode`, kind: 'diode', from: d.to, to: d.from, device: d.id, gated: false, ...rating });
    }
  }
  return out;
}

/**
 * Ids of the gated elements (switch channels) of a leg, in netlist order.
 *
 * @param leg - a leg netlist
 * @returns the ids of every IGBT and MOSFET
 * @example
 * ```ts
 * gatedDeviceIds(builtinLeg('tnpc')); // ['upper', 'lower', 'neutralToOut', 'outToNeutral']
 * ```
 */
export function gatedDeviceIds(leg: LegNetlist): string[] {
  return leg.devices.filter((d) => d.kind !== 'diode').map((d) => d.id);
}

/**
 * Ids of the devices without a voltage rating (their blocking voltage is not checked).
 *
 * @param leg - a leg netlist
 * @returns device ids in netlist order
 * @example
 * ```ts
 * unratedDevices(builtinLeg('npc')); // [] (every built-in device is rated)
 * ```
 */
export function unratedDevices(leg: LegNetlist): string[] {
  return leg.devices.filter((d) => d.rating === undefined).map((d) => d.id);
}

/**
 * The leg's DC potentials without repeats, ascending (units of Vdc/2): its levels.
 *
 * @param leg - the leg netlist
 * @returns the levels
 * @example
 * ```ts
 * legLevels(builtinLeg('npc')); // [-1, 0, 1]
 * ```
 */
export function legLevels(leg: LegNetlist): number[] {
  return [...new Set(Object.values(leg.dcNodes))].sort((x, y) => x - y);
}

/**
 * Whether a set of DC potentials has a midpoint: a node at potential 0 with others above and
 * below it (the node that draws the phases' current at level 0 and whose voltage must be kept
 * balanced). The one test every part of the core uses.
 *
 * @param levels - DC potentials (units of Vdc/2), as {@link legLevels} gives them
 * @returns true for a split DC link
 * @example
 * ```ts
 * hasMidpoint([-1, 0, 1]); // true
 * hasMidpoint([-1, 1]); // false
 * ```
 */
export function hasMidpoint(levels: readonly number[]): boolean {
  return levels.includes(0) && levels.some((l) => l > 0) && levels.some((l) => l < 0);
}
