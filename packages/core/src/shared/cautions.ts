/**
 * The safety cautions every review output carries. Operating a converter with a failed device is
 * a hazard; these lines travel with the numbers so that nobody reads one without the other.
 */
export const CAUTIONS: readonly string[] = [
  'Operating a converter with a failed device can overstress the remaining devices, the DC link (capacitors, midpoint balance) and the load.',
  'These results are an engineering aid computed from an idealised netlist (ideal switches and diodes, no dead time, no commutation transients); confirm them by test and against the device ratings before use.',
  'Local electrical codes, the equipment standards that apply and licensed engineering practice come first.',
];
