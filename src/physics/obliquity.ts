/**
 * Spin–orbit geometry: the true (3D) obliquity ψ from the sky-projected angle λ
 * and the two inclinations, the orbital inclination from the impact parameter,
 * and a naive stellar inclination from rotation.
 *
 * Angles are radians. Inclinations are measured from the line of sight
 * (i = 90° edge-on). λ follows the convention of `src/model/rm.ts`.
 * @module
 */
import type { Days, KilometersPerSecond, Radians, SolarRadii } from "../units.ts";

/** Nominal solar radius in km (IAU 2015 Resolution B3: R☉ = 6.957e8 m). */
const SOLAR_RADIUS_KM = 6.957e5;
/** Seconds per day. */
const SECONDS_PER_DAY = 86400;

/** The two inclinations that, with λ, fix the obliquity. */
export interface ObliquityInclinations {
  /** Inclination i★ of the stellar spin axis to the line of sight (0 = pole-on). */
  starInclination: Radians;
  /** Inclination i of the orbit normal to the line of sight (90° = edge-on). */
  orbitInclination: Radians;
}

/**
 * True obliquity ψ ∈ [0, π], the angle between the stellar spin axis and the
 * orbit normal, from
 *
 *     cos ψ = cos i★ cos i + sin i★ sin i cos λ
 *
 * (Fabrycky & Winn 2009, ApJ 696, 1230, eq. 1 — equation number recalled, not
 * verified; it is the spherical law of cosines for the two axes whose polar
 * angles from the line of sight are i★ and i and whose sky-projected azimuths
 * differ by λ).
 *
 * Note: rotation data give sin i★, hence i★ or π − i★; the two choices give
 * different ψ unless i = 90°. Callers sampling i★ from sin i★ should draw the
 * branch as well (or report both).
 *
 * Returns `NaN` for non-finite input.
 *
 * @example
 * ```ts
 * obliquity(0.3, { starInclination: Math.PI / 2, orbitInclination: Math.PI / 2 }); // 0.3
 * ```
 */
export function obliquity(lambda: Radians, inclinations: ObliquityInclinations): Radians {
  const iStar = inclinations.starInclination;
  const i = inclinations.orbitInclination;
  // Written as the angle between two unit vectors via atan2(|a × b|, a · b),
  // which stays accurate near ψ = 0 and π where acos loses digits.
  // Spin  a = (sin i★ sin λ, sin i★ cos λ, cos i★), orbit normal b = (0, sin i, cos i)
  // (sky axes as in rm.ts, third axis toward the observer).
  const ax = Math.sin(iStar) * Math.sin(lambda);
  const ay = Math.sin(iStar) * Math.cos(lambda);
  const az = Math.cos(iStar);
  const by = Math.sin(i);
  const bz = Math.cos(i);
  const dot = ay * by + az * bz; // = cos i★ cos i + sin i★ sin i cos λ
  const cx = ay * bz - az * by;
  const cy = -ax * bz;
  const cz = ax * by;
  return Math.atan2(Math.sqrt(cx * cx + cy * cy + cz * cz), dot);
}

/** Options for {@link inclinationFromImpact}. */
export interface InclinationFromImpactOptions {
  /**
   * Orbital eccentricity, 0 ≤ e < 1.
   * @default 0
   */
  eccentricity?: number;
  /**
   * Star's argument of periastron ω (radians), as in the Keplerian.
   * @default π/2 (irrelevant when e = 0)
   */
  argPeriastron?: Radians;
}

/**
 * Orbital inclination i ∈ [0, π/2] from the transit impact parameter b ≥ 0:
 *
 *     b = (a cos i / R★) (1 − e²) / (1 + e sin ω)
 *
 * (Winn 2010, "Transits and Occultations", arXiv:1001.2010, eq. 7; recalled),
 * with ω the star's argument of periastron as in the RV Keplerian, so that
 * conjunction falls at true anomaly π/2 − ω.
 *
 * Returns `NaN` when b < 0, a/R★ ≤ 0, e outside [0, 1), cos i > 1 (no
 * inclination gives that b), or any input is not finite.
 *
 * @example
 * ```ts
 * inclinationFromImpact(0, 10); // π/2
 * ```
 */
export function inclinationFromImpact(
  impact: number,
  aOverRstar: number,
  options: InclinationFromImpactOptions = {},
): Radians {
  const e = options.eccentricity ?? 0;
  const omega = options.argPeriastron ?? Math.PI / 2;
  if (
    !(impact >= 0 && impact < Infinity) || !(aOverRstar > 0 && aOverRstar < Infinity) ||
    !(e >= 0 && e < 1) || !Number.isFinite(omega)
  ) {
    return NaN;
  }
  const cosI = (impact * (1 + e * Math.sin(omega))) / (aOverRstar * (1 - e * e));
  if (!(cosI <= 1)) return NaN;
  return Math.acos(cosI);
}

/** Stellar radius and rotation period for {@link starInclinationFromRotation}. */
export interface StellarRotation {
  /** Equatorial rotation period (days). */
  rotationPeriod: Days;
  /** Stellar radius (solar radii; IAU 2015 nominal R☉). */
  radius: SolarRadii;
}

/**
 * Naive stellar inclination i★ ∈ [0, π/2] from
 *
 *     sin i★ = v sin i★ · P_rot / (2π R★)
 *
 * (the equatorial speed of a rigid rotator is 2π R★ / P_rot; common practice,
 * e.g. Masuda & Winn 2020, AJ 159, 81, Sect. 1; recalled).
 *
 * Caution: applied to point estimates, or sample by sample to independent
 * posteriors of v sin i★ and v = 2π R★ / P_rot, this estimator is biased:
 * v and v sin i★ are not independent, and dividing them neglects that
 * v sin i★ ≤ v. Masuda & Winn (2020) show that the correct inference treats v
 * and cos i★ as the parameters (with v sin i★ = v √(1 − cos² i★)) and that the
 * naive ratio can mislead, especially when sin i★ is near 1. Use this function
 * for quick looks; the posterior of i★ should come from a model in v and cos i★.
 *
 * Returns `NaN` when the ratio exceeds 1 (inconsistent inputs), or inputs are
 * negative, zero (radius, period) or not finite; returns the branch i★ ≤ π/2
 * (π − i★ fits equally well; see {@link obliquity}).
 *
 * @example
 * ```ts
 * starInclinationFromRotation(2, { rotationPeriod: 20, radius: 1 }); // ≈ 0.91 rad
 * ```
 */
export function starInclinationFromRotation(
  vsini: KilometersPerSecond,
  star: StellarRotation,
): Radians {
  const period = star.rotationPeriod;
  const radius = star.radius;
  if (
    !(vsini >= 0 && vsini < Infinity) || !(period > 0 && period < Infinity) ||
    !(radius > 0 && radius < Infinity)
  ) {
    return NaN;
  }
  const equatorialSpeed = (2 * Math.PI * radius * SOLAR_RADIUS_KM) / (period * SECONDS_PER_DAY);
  const sinI = vsini / equatorialSpeed;
  if (!(sinI <= 1)) return NaN;
  return Math.asin(sinI);
}
