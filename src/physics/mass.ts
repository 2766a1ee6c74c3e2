/**
 * Planet masses and orbit sizes from a Keplerian orbit and the star's mass: mass
 * function, minimum and true mass from the full (not small-planet) relation,
 * semi-amplitude from mass, and Kepler's third law with M★ + m.
 *
 * Units: periods in days, K in m/s, masses in solar masses (convert with
 * `solarToJupiterMasses` / `solarToEarthMasses`), a in au.
 * @module
 */
import type { AstronomicalUnits, Days, MetersPerSecond, Radians, SolarMasses } from "../units.ts";
import { AU, DAY, GM_SUN } from "./constants.ts";

/** The orbital elements the masses depend on (an `Orbit` fits). */
export interface OrbitSize {
  period: Days;
  semiAmplitude: MetersPerSecond;
  eccentricity: number;
}

/**
 * Mass function f(m) = P K³ (1 − e²)^{3/2}/(2πG) = (m sin i)³/(M★ + m)², in solar
 * masses (Lovis & Fischer 2010, in Exoplanets, ed. Seager, §2; the standard
 * spectroscopic-binary mass function, e.g. Hilditch 2001, An Introduction to
 * Close Binary Stars, §2.4; recalled from memory). `NaN` for e outside [0, 1)
 * or a non-positive period.
 */
export function massFunction(orbit: OrbitSize): SolarMasses {
  const { period, semiAmplitude: k, eccentricity: e } = orbit;
  if (!(e >= 0 && e < 1) || !(period > 0)) return NaN;
  const k3 = k * k * k;
  const oneMinusE2 = (1 - e) * (1 + e);
  return period * DAY * Math.abs(k3) * oneMinusE2 * Math.sqrt(oneMinusE2) / (2 * Math.PI * GM_SUN);
}

/**
 * Solve m (M + m)^{−2/3} = target for m ≥ 0 (M > 0, target ≥ 0).
 *
 * The left side is increasing and concave in m (second derivative
 * −(M + m)^{−8/3}(4M/3 + 2m/9) < 0), so Newton's method from the small-planet
 * value m₀ = target·M^{2/3}, which lies below the root, rises monotonically to
 * it; the loop stops when an update no longer increases m (machine precision).
 */
function solveMassRelation(target: number, starMass: number): number {
  if (!(target >= 0) || !(starMass > 0)) return NaN;
  if (target === 0) return 0;
  let m = target * Math.cbrt(starMass * starMass);
  for (let it = 0; it < 200; it++) {
    const total = starMass + m;
    const c = Math.cbrt(total);
    const g = m / (c * c) - target;
    const slope = (starMass + m / 3) / (total * c * c);
    const next = m - g / slope;
    if (!(next > m)) break;
    m = next;
  }
  return m;
}

/**
 * Minimum mass m sin i in solar masses from (m sin i)³/(M★ + m sin i)² = f(m):
 * the exact root, not the small-planet approximation m sin i ≈ f^{1/3} M★^{2/3}.
 * `NaN` for invalid inputs (e outside [0, 1), non-positive period or star mass).
 *
 * @example
 * ```ts
 * const msini = minimumMass({ period: 4332.6, semiAmplitude: 12.5, eccentricity: 0.05 }, 1);
 * solarToJupiterMasses(msini); // ≈ 1.0
 * ```
 */
export function minimumMass(orbit: OrbitSize, starMass: SolarMasses): SolarMasses {
  return solveMassRelation(Math.cbrt(massFunction(orbit)), starMass);
}

/** Options for {@link trueMass}. */
export interface TrueMassOptions {
  /** Orbital inclination i (radians; 90° = edge-on). */
  inclination: Radians;
}

/**
 * True mass m in solar masses given the inclination:
 * m³ sin³ i/(M★ + m)² = f(m), solved exactly. `NaN` when sin i ≤ 0 or other
 * inputs are invalid.
 */
export function trueMass(
  orbit: OrbitSize,
  starMass: SolarMasses,
  options: TrueMassOptions,
): SolarMasses {
  const sinI = Math.sin(options.inclination);
  if (!(sinI > 0)) return NaN;
  return solveMassRelation(Math.cbrt(massFunction(orbit)) / sinI, starMass);
}

/** Options for {@link semiAmplitudeFromMass}. */
export interface SemiAmplitudeFromMassOptions {
  period: Days;
  eccentricity: number;
  /** Star mass (solar masses). */
  starMass: SolarMasses;
  /** Inclination (radians). @default π/2 (then `planetMass` is m sin i) */
  inclination?: Radians;
}

/**
 * RV semi-amplitude of the star, in m/s, from the planet's mass (solar masses):
 *   K = (2π G/P)^{1/3} m sin i (M★ + m)^{−2/3} (1 − e²)^{−1/2}
 * (Lovis & Fischer 2010, in Exoplanets, ed. Seager, §2, eq. for K; Cumming et al.
 * 1999, ApJ 526, 890, eq. 1; recalled from memory). With the default
 * inclination, m sin i = m. `NaN` for invalid inputs.
 */
export function semiAmplitudeFromMass(
  planetMass: SolarMasses,
  options: SemiAmplitudeFromMassOptions,
): MetersPerSecond {
  const { period, eccentricity: e, starMass } = options;
  const sinI = Math.sin(options.inclination ?? Math.PI / 2);
  if (!(e >= 0 && e < 1) || !(period > 0) || !(starMass > 0) || !(planetMass >= 0)) return NaN;
  const total = starMass + planetMass;
  return Math.cbrt(2 * Math.PI * GM_SUN / (period * DAY)) * planetMass * sinI /
    Math.cbrt(total * total) / Math.sqrt((1 - e) * (1 + e));
}

/** Options for {@link semiMajorAxis}. */
export interface SemiMajorAxisOptions {
  /** Planet mass (solar masses). @default 0 */
  planetMass?: SolarMasses;
}

/**
 * Semi-major axis of the relative orbit in au from Kepler's third law,
 * a³ = G (M★ + m) P²/(4π²) (Murray & Dermott 1999, Solar System Dynamics,
 * eq. 2.22; recalled from memory). `NaN` for a non-positive period or mass.
 */
export function semiMajorAxis(
  period: Days,
  starMass: SolarMasses,
  options: SemiMajorAxisOptions = {},
): AstronomicalUnits {
  const total = starMass + (options.planetMass ?? 0);
  if (!(period > 0) || !(total > 0)) return NaN;
  const p = period * DAY;
  return Math.cbrt(GM_SUN * total * p * p / (4 * Math.PI * Math.PI)) / AU;
}
