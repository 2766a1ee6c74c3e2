/**
 * Physical constants. Masses are handled through the nominal GM products, so no
 * value of G enters (IAU 2015 Resolution B3 recommends exactly this).
 * @module
 */

/**
 * Nominal solar mass parameter (GM)☉ᴺ = 1.3271244e20 m³ s⁻²: IAU 2015
 * Resolution B3 (Prša et al. 2016, AJ 152, 41, Table 1).
 */
export const GM_SUN = 1.3271244e20;
/** Nominal Jovian mass parameter (GM)♃ᴺ = 1.2668653e17 m³ s⁻²: IAU 2015 Resolution B3. */
export const GM_JUPITER = 1.2668653e17;
/** Nominal terrestrial mass parameter (GM)⊕ᴺ = 3.986004e14 m³ s⁻²: IAU 2015 Resolution B3. */
export const GM_EARTH = 3.986004e14;
/** Nominal solar radius R☉ᴺ = 6.957e8 m: IAU 2015 Resolution B3. */
export const R_SUN = 6.957e8;
/** Astronomical unit, exactly 149 597 870 700 m: IAU 2012 Resolution B2. */
export const AU = 149_597_870_700;
/** Seconds per day (the Julian-calendar day of 86 400 SI seconds; common practice). */
export const DAY = 86_400;

/** Jupiter masses per solar mass, (GM)☉ᴺ/(GM)♃ᴺ ≈ 1047.57. */
export const SOLAR_TO_JUPITER_MASS = GM_SUN / GM_JUPITER;
/** Earth masses per solar mass, (GM)☉ᴺ/(GM)⊕ᴺ ≈ 332 946. */
export const SOLAR_TO_EARTH_MASS = GM_SUN / GM_EARTH;

/** Solar masses → Jupiter masses, by the nominal GM ratio. */
export function solarToJupiterMasses(mass: number): number {
  return mass * (GM_SUN / GM_JUPITER);
}
/** Jupiter masses → solar masses. */
export function jupiterToSolarMasses(mass: number): number {
  return mass * (GM_JUPITER / GM_SUN);
}
/** Solar masses → Earth masses, by the nominal GM ratio. */
export function solarToEarthMasses(mass: number): number {
  return mass * (GM_SUN / GM_EARTH);
}
/** Earth masses → solar masses. */
export function earthToSolarMasses(mass: number): number {
  return mass * (GM_EARTH / GM_SUN);
}
