/** Kinds of device a leg netlist can hold. */
export type DeviceKind = 'igbt' | 'mosfet' | 'diode';

/** How often a device is meant to switch: at the PWM carrier or at the fundamental (line) frequency. */
export type SwitchingClass = 'pwm' | 'line';

/**
 * One device of a leg as written in a netlist file. `from → to` is the forward direction
 * (collector→emitter, drain→source, anode→cathode).
 */
export interface DeviceSpec {
  /** Unique id within the leg, e.g. `outerUpper`. */
  readonly id: string;
  readonly kind: DeviceKind;
  readonly from: string;
  readonly to: string;
  /** Adds the element `<id>.diode` conducting `to → from` (antiparallel or body diode). */
  readonly antiparallelDiode?: boolean;
  /** Intended switching rate; used to flag line-frequency devices driven at PWM rate. */
  readonly switching?: SwitchingClass;
  /** Free technology label, e.g. `Si IGBT`, `SiC MOSFET`. */
  readonly technology?: string;
  /**
   * Voltage the device may block, units of Vdc/2 (> 0). It applies to the switch and to its
   * antiparallel diode. Absent: the device is not checked and documents list it as unrated.
   */
  readonly rating?: number;
}

/**
 * A converter leg: DC nodes with potentials in units of Vdc/2, an output node, devices and the
 * named gate patterns (each pattern lists the switches gated on).
 */
export interface LegNetlist {
  readonly name: string;
  readonly dcNodes: Readonly<Record<string, number>>;
  readonly output: string;
  readonly devices: readonly DeviceSpec[];
  readonly patterns: Readonly<Record<string, readonly string[]>>;
}

/**
 * A conducting element of the expanded leg: a switch channel or a diode.
 * Antiparallel diodes become their own elements so that each can fail on its own.
 */
export interface LegElement {
  /** Element id: the device id, or `<device>.diode` for an antiparallel/body diode. */
  readonly id: string;
  /** `igbt`/`mosfet` channels need a gate signal; diodes always conduct forward. */
  readonly kind: DeviceKind;
  readonly from: string;
  readonly to: string;
  /** The device this element belongs to (itself for a channel or a stand-alone diode). */
  readonly device: string;
  /** True for switch channels (they take a gate signal). */
  readonly gated: boolean;
  /** Blocking rating of the device, units of Vdc/2; `undefined` when unrated. */
  readonly rating?: number;
}
