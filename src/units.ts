/**
 * Units carried in the type. Each unit is a `number` with an optional brand, so a
 * plain number literal is accepted where a unit is expected, while a value already
 * branded with one unit is refused where another is expected (`Days` is not
 * assignable to `MetersPerSecond`).
 *
 * Inside rvwalk angles are radians and times are days (BJD or any consistent
 * day count); degrees appear only at text boundaries (spec, tables, screen).
 * @module
 */

declare const unit: unique symbol;

/** A number tagged with a unit name. */
export type Unit<Name extends string> = number & { readonly [unit]?: Name };

/** Time in days (BJD, or any consistent day count). */
export type Days = Unit<"d">;
/** Velocity in metres per second. */
export type MetersPerSecond = Unit<"m/s">;
/** Velocity in kilometres per second. */
export type KilometersPerSecond = Unit<"km/s">;
/** Angle in radians. */
export type Radians = Unit<"rad">;
/** Angle in degrees (text boundaries only). */
export type Degrees = Unit<"deg">;
/** Mass in solar masses. */
export type SolarMasses = Unit<"Msun">;
/** Mass in Jupiter masses. */
export type JupiterMasses = Unit<"Mjup">;
/** Mass in Earth masses. */
export type EarthMasses = Unit<"Mearth">;
/** Length in astronomical units. */
export type AstronomicalUnits = Unit<"au">;
/** Length in solar radii. */
export type SolarRadii = Unit<"Rsun">;
/** Seconds. */
export type Seconds = Unit<"s">;

/** Degrees to radians. */
export function degToRad(deg: Degrees): Radians {
  return (deg * Math.PI) / 180;
}

/** Radians to degrees. */
export function radToDeg(rad: Radians): Degrees {
  return (rad * 180) / Math.PI;
}
