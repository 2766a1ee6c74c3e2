/**
 * Physics: IAU nominal constants, mass function, minimum and true masses,
 * semi-amplitude from mass, Kepler's third law.
 * @module
 */
export * from "./constants.ts";
export * from "./mass.ts";
export * from "./obliquity.ts";
