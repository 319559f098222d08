/**
 * Distance below which two space vectors are the same point (units of Vdc/2).
 * Level potentials are short decimal numbers, so distinct vectors differ by far more than this,
 * while the rounding of the Clarke transform stays far below it.
 */
export const VECTOR_TOLERANCE = 1e-9;

/** Area (units of (Vdc/2)²) below which a triangle or hull counts as degenerate. */
export const AREA_TOLERANCE = 1e-12;

/** Barycentric slack accepted when locating a reference inside a triangle. */
export const DWELL_TOLERANCE = 1e-9;
