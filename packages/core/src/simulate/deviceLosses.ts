import { fileValue, HexsalvageInputError } from '../shared/errors.js';
import type { LegElement } from '../netlist/netlist.js';

/** Loss parameters of a switch channel (IGBT: v0 + r·i; MOSFET: rOn·i²), energies per event in joules. */
export interface SwitchParameters {
  /** IGBT on-state threshold voltage, V (ignored for a MOSFET). */
  readonly v0?: number;
  /** IGBT slope resistance, Ω. */
  readonly r?: number;
  /** MOSFET on-resistance, Ω (conducts both ways when gated). */
  readonly rOn?: number;
  /** Turn-on and turn-off energy at (vRef, iRef), J. */
  readonly eOn: number;
  readonly eOff: number;
  readonly vRef: number;
  readonly iRef: number;
}

/** Loss parameters of a diode: v0 + r·i, reverse-recovery energy per turn-off at (vRef, iRef). */
export interface DiodeParameters {
  readonly v0: number;
  readonly r: number;
  readonly eRec: number;
  readonly vRef: number;
  readonly iRef: number;
}

/** Parameters of one device (a switch with its antiparallel diode, or a stand-alone diode). */
export interface DeviceParameters {
  readonly switch?: SwitchParameters;
  readonly diode?: DiodeParameters;
  /** Junction-to-heatsink thermal resistance, K/W (optional; equal for all devices when absent). */
  readonly thermalResistance?: number;
}

/** A device-parameter file (docs/schema/devices.schema.json). */
export interface DeviceParameterSet {
  readonly name: string;
  /**
   * By device id, then by kind (`igbt`, `mosfet`, `diode`), then `*`: the first entry that has the
   * part needed (`switch` for a channel, `diode` for a diode) is used.
   */
  readonly devices: Readonly<Record<string, DeviceParameters>>;
}

/**
 * Invented demo parameters (not from any datasheet): a 1200 V, 300 A class IGBT module with its
 * diode, a 1200 V SiC MOSFET of similar current, and a clamp diode. Good for showing how losses
 * shift when a leg runs degraded; replace them with the datasheet values of the real devices.
 */
export const DEMO_DEVICES: DeviceParameterSet = {
  name: 'hexsalvage demo devices (invented values, not a datasheet)',
  devices: {
    igbt: {
      switch: { v0: 0.85, r: 0.0035, eOn: 0.018, eOff: 0.024, vRef: 600, iRef: 300 },
      diode: { v0: 0.9, r: 0.0028, eRec: 0.011, vRef: 600, iRef: 300 },
    },
    mosfet: {
      switch: { rOn: 0.0065, eOn: 0.0042, eOff: 0.0021, vRef: 600, iRef: 300 },
      diode: { v0: 1.6, r: 0.004, eRec: 0.0006, vRef: 600, iRef: 300 },
    },
    diode: { diode: { v0: 0.95, r: 0.003, eRec: 0.009, vRef: 600, iRef: 300 } },
  },
};

/** The parameters that apply to one element. */
export type ElementParameters =
  | { readonly part: 'igbt'; readonly p: SwitchParameters; readonly rth: number | undefined }
  | { readonly part: 'mosfet'; readonly p: SwitchParameters; readonly rth: number | undefined }
  | { readonly part: 'diode'; readonly p: DiodeParameters; readonly rth: number | undefined };

/**
 * Finds the parameters of an element: its device's entry, else its kind's, else `*`.
 *
 * @param set - the parameter set
 * @param e - the element (a channel uses `switch`, a diode `diode`)
 * @param kindOfDevice - the kind of the element's device (an antiparallel diode looks up its switch's kind too)
 * @returns the parameters, or an input error naming the missing entry
 * @example
 * ```ts
 * elementParameters(DEMO_DEVICES, element, 'igbt').part; // 'igbt'
 * ```
 */
export function elementParameters(set: DeviceParameterSet, e: LegElement, kindOfDevice: string): ElementParameters {
  const want = e.gated ? 'switch' : 'diode';
  for (const key of [e.device, kindOfDevice, e.kind, '*']) {
    const d = set.devices[key];
    const part = d?.[want];
    if (part) {
      if (want === 'diode') return { part: 'diode', p: part as DiodeParameters, rth: d.thermalResistance };
      return { part: e.kind === 'mosfet' ? 'mosfet' : 'igbt', p: part as SwitchParameters, rth: d.thermalResistance };
    }
  }
  throw new HexsalvageInputError(
    'option',
    set.name,
    `devices.${e.device}.${want}`,
    `loss parameters for ${e.id} (a "${want}" entry under "${e.device}", "${kindOfDevice}" or "*")`,
  );
}

/**
 * Conduction loss of an element from its average and RMS current over a period: v0·Iavg + r·Irms²
 * for an IGBT channel or a diode (threshold voltage plus slope resistance), rOn·Irms² for a MOSFET
 * channel (common practice; e.g. the loss equations of semiconductor application manuals).
 *
 * @param ep - the element's parameters
 * @param avg - average current over the period, A
 * @param rms - RMS current over the period, A
 * @returns watts
 * @example
 * ```ts
 * conductionLoss({ part: 'diode', p: { v0: 1, r: 0.01, eRec: 0, vRef: 1, iRef: 1 }, rth: undefined }, 10, 10); // 11
 * ```
 */
export function conductionLoss(ep: ElementParameters, avg: number, rms: number): number {
  if (ep.part === 'mosfet') return (ep.p.rOn ?? 0) * rms * rms;
  return (ep.p.v0 ?? 0) * avg + (ep.p.r ?? 0) * rms * rms;
}

/**
 * Energy of one switching event, scaled linearly with the commutated voltage and current from the
 * reference values (common practice for loss estimates from datasheet energies).
 *
 * @param eRef - energy at (vRef, iRef), J
 * @param vRef - reference voltage, V
 * @param iRef - reference current, A
 * @param v - commutated voltage, V
 * @param i - commutated current, A (magnitude)
 * @returns joules
 * @example
 * ```ts
 * eventEnergy(0.02, 600, 300, 375, 150); // 0.00625
 * ```
 */
export function eventEnergy(eRef: number, vRef: number, iRef: number, v: number, i: number): number {
  return eRef * (v / vRef) * (Math.abs(i) / iRef);
}

/**
 * Checks a device-parameter document (as read from JSON).
 *
 * @param doc - the parsed JSON
 * @param input - file name for errors
 * @returns the parameter set
 * @example
 * ```ts
 * parseDeviceParameters(JSON.parse(text), 'devices.json');
 * ```
 */
export function parseDeviceParameters(doc: unknown, input: string): DeviceParameterSet {
  const err = (key: string, expected: string, got?: unknown) =>
    new HexsalvageInputError('option', input, key, expected, got === undefined ? undefined : fileValue(got));
  if (typeof doc !== 'object' || doc === null || Array.isArray(doc))
    throw err('(document)', 'an object { "name", "devices": { ID|KIND|"*": { "switch"?, "diode"?, "thermalResistance"? } } }', doc);
  const o = doc as Record<string, unknown>;
  for (const k of Object.keys(o)) if (!['$schema', 'name', 'devices'].includes(k)) throw err(k, 'one of the keys name, devices', k);
  if (typeof o.name !== 'string' || o.name === '') throw err('name', 'a name for the parameter set', o.name);
  if (typeof o.devices !== 'object' || o.devices === null || Array.isArray(o.devices))
    throw err('devices', 'an object keyed by device id, kind or "*"', o.devices);
  const num = (v: unknown, key: string, min = 0) => {
    if (typeof v !== 'number' || !Number.isFinite(v) || v < min || v > 1e6) throw err(key, `a number from ${min} up to 1e6`, v);
    return v;
  };
  const pos = (v: unknown, key: string) => {
    if (typeof v !== 'number' || !Number.isFinite(v) || v <= 0 || v > 1e7) throw err(key, 'a number above 0', v);
    return v;
  };
  const devices: Record<string, DeviceParameters> = {};
  for (const [id, raw] of Object.entries(o.devices as Record<string, unknown>)) {
    const at = `devices.${id}`;
    if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) throw err(at, 'an object { "switch"?, "diode"?, "thermalResistance"? }', raw);
    const r = raw as Record<string, unknown>;
    for (const k of Object.keys(r))
      if (!['switch', 'diode', 'thermalResistance'].includes(k)) throw err(`${at}.${k}`, 'one of switch, diode, thermalResistance', k);
    let sw: SwitchParameters | undefined;
    if (r.switch !== undefined) {
      const s = r.switch as Record<string, unknown>;
      if (typeof s !== 'object' || s === null) throw err(`${at}.switch`, 'an object', s);
      for (const k of Object.keys(s))
        if (!['v0', 'r', 'rOn', 'eOn', 'eOff', 'vRef', 'iRef'].includes(k)) throw err(`${at}.switch.${k}`, 'one of v0, r, rOn, eOn, eOff, vRef, iRef', k);
      sw = {
        ...(s.v0 !== undefined ? { v0: num(s.v0, `${at}.switch.v0`) } : {}),
        ...(s.r !== undefined ? { r: num(s.r, `${at}.switch.r`) } : {}),
        ...(s.rOn !== undefined ? { rOn: num(s.rOn, `${at}.switch.rOn`) } : {}),
        eOn: num(s.eOn, `${at}.switch.eOn`),
        eOff: num(s.eOff, `${at}.switch.eOff`),
        vRef: pos(s.vRef, `${at}.switch.vRef`),
        iRef: pos(s.iRef, `${at}.switch.iRef`),
      };
    }
    let di: DiodeParameters | undefined;
    if (r.diode !== undefined) {
      const s = r.diode as Record<string, unknown>;
      if (typeof s !== 'object' || s === null) throw err(`${at}.diode`, 'an object', s);
      for (const k of Object.keys(s)) if (!['v0', 'r', 'eRec', 'vRef', 'iRef'].includes(k)) throw err(`${at}.diode.${k}`, 'one of v0, r, eRec, vRef, iRef', k);
      di = {
        v0: num(s.v0, `${at}.diode.v0`),
        r: num(s.r, `${at}.diode.r`),
        eRec: num(s.eRec, `${at}.diode.eRec`),
        vRef: pos(s.vRef, `${at}.diode.vRef`),
        iRef: pos(s.iRef, `${at}.diode.iRef`),
      };
    }
    const rth = r.thermalResistance === undefined ? undefined : pos(r.thermalResistance, `${at}.thermalResistance`);
    devices[id] = { ...(sw ? { switch: sw } : {}), ...(di ? { diode: di } : {}), ...(rth !== undefined ? { thermalResistance: rth } : {}) };
  }
  return { name: o.name, devices };
}
