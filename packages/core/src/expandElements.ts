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
    out.push({ id: d.id, kind: d.kind, from: d.from, to: d.to, device: d.id, gated: d.kind !== 'diode' });
    if (d.antiparallelDiode && d.kind !== 'diode') {
      out.push({ id: `${d.id}.diode`, kind: 'diode', from: d.to, to: d.from, device: d.id, gated: false });
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
