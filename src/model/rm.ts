/**
 * Rossiter–McLaughlin (RM) anomalous radial velocity of a star with quadratic
 * limb darkening while a planet transits it.
 *
 * ## Sky-plane geometry and sign convention
 *
 * Lengths are in stellar radii, the star centred at the origin. The observer
 * looks down the −Z axis (+Z points at the observer); X and Y span the sky, X to
 * the right along the planet's sky motion at conjunction, Y up along the sky
 * projection of the orbit normal n (right-handed, as in Winn 2010,
 * arXiv:1001.2010, eqs. 2–4). For an inclination i < 90° the transit chord lies
 * below the centre, at Y ≈ −b. The sky projection s of the stellar spin axis
 * makes the angle λ with n, measured from s to n counterclockwise as seen by
 * the observer; λ = 0 is aligned, λ = ±180° retrograde.
 *
 * ```text
 *                      n  (+Y, sky-projected orbit normal)
 *                      ^     s  (sky-projected stellar spin axis)
 *                      |    /
 *                      | λ /
 *        approaching   |  /     receding
 *        (blue, v < 0) | /      (red, v > 0)
 *                      |/
 *     -----------------O-----------------> +X  planet's sky motion
 *                     /|
 *                    / |
 *     ---(p)--->----/--+-----------------  transit chord, Y = -b
 *                  /   |
 *
 *   rigid rotation: v(X, Y) = v sin i* · (X cos λ − Y sin λ)   (positive = receding)
 *   at mid-transit (0, −b):  v = +b · v sin i* · sin λ
 * ```
 *
 * The star's near side turns towards +X for λ = 0, so an aligned planet hides
 * the approaching (blue) half first and the anomaly runs positive then negative.
 * With b > 0 and λ > 0 the chord lies more over the receding half, so the
 * anomaly at mid-transit is negative; λ → λ + 180° flips the sign of the whole
 * curve. `impact` b is the sky separation at conjunction (b ≥ 0, unsigned).
 *
 * ## Orbit
 *
 * `argPeriastron` is the star's ω as in the Keplerian v = K [cos(ν + ω) + e cos ω],
 * so conjunction (transit) falls at true anomaly ν = π/2 − ω (Winn 2010, Sect.
 * 2). The planet's position relative to the star (Winn 2010, eqs. 2–4):
 * X = −r cos(ω + ν), Y = −r sin(ω + ν) cos i, Z = r sin(ω + ν) sin i with
 * r = a (1 − e cos E); the planet is in front of the star when Z > 0, so
 * occultations (Z < 0) add nothing. The inclination follows from b by
 * cos i = b (1 + e sin ω) / [(a/R★)(1 − e²)] (Winn 2010, eq. 7). Kepler's
 * equation is solved by a private safeguarded Newton iteration (not
 * `kepler.ts`, which was still being written when this file was).
 *
 * ## Anomaly
 *
 * First-moment definition (Ohta, Taruya & Suto 2005, ApJ 622, 1118, Sect. 2:
 * the velocity shift is the first moment of the distorted line, which for a
 * rigidly rotating star reduces to the intensity-weighted mean velocity of the
 * visible surface; recalled, their equation numbers not verified here):
 *
 *     ΔV = −∫_hidden I v dA / (∫_star I dA − ∫_hidden I dA),
 *
 * i.e. −(flux-weighted mean sub-planet velocity) × f/(1 − f) with f the hidden
 * flux fraction. The hidden flux and its first moment are integrated exactly in
 * angle and by 16-node Gauss–Legendre quadrature in radius (see
 * `_rm_occultation.ts`), valid for any overlap, including grazing chords. By the
 * mirror symmetry of the hidden region about the line from the star centre to
 * the planet centre (X, Y) at distance d, ∫_hidden I (X', Y') dA = F1 (X, Y)/d,
 * hence ΔV = −v sin i* · F1 (X cos λ − Y sin λ) / [d (F★ − F0)].
 * This is the line-centroid anomaly; it ignores the line-width terms that
 * matter for cross-correlation velocities of fast rotators (Hirano et al. 2010,
 * ApJ 709, 458; Hirano et al. 2011, ApJ 742, 69).
 *
 * ## Exposure smearing
 *
 * With `exposure` set, each time is replaced by the mean of `supersample`
 * evaluations at the midpoints of equal sub-intervals of the exposure (midpoint
 * rule; Kipping 2010, MNRAS 408, 1758, for the practice of supersampling long
 * integrations).
 * @module
 */
import type { Days, KilometersPerSecond, Radians, Seconds } from "../units.ts";
import { occultedMoments, stellarFlux } from "./_rm_occultation.ts";

/** Parameters of the RM anomaly of one transiting planet. */
export interface RmParams {
  /** Orbital period (days), shared with the planet's Keplerian. */
  period: Days;
  /** Time of conjunction = mid-transit (days), shared with the Keplerian. */
  timeConjunction: Days;
  /** Orbital eccentricity, 0 ≤ e < 1. */
  eccentricity: number;
  /** Star's argument of periastron ω (radians), as in the Keplerian. */
  argPeriastron: Radians;
  /** Sky-projected spin–orbit angle λ (radians); see the module sketch. */
  lambda: Radians;
  /** Projected equatorial rotation speed v sin i★ (km/s), ≥ 0. */
  vsini: KilometersPerSecond;
  /** Planet-to-star radius ratio Rp/R★, 0 ≤ k < 1. */
  radiusRatio: number;
  /** Semi-major axis of the relative orbit in stellar radii, a/R★. */
  aOverRstar: number;
  /** Impact parameter b ≥ 0: sky separation at conjunction in stellar radii. */
  impact: number;
  /** Linear coefficient of the quadratic limb-darkening law. */
  u1: number;
  /** Quadratic coefficient of the quadratic limb-darkening law. */
  u2: number;
  /**
   * Exposure time (seconds). When given and positive, each point is averaged
   * over its exposure.
   * @default undefined (no smearing)
   */
  exposure?: Seconds;
  /**
   * Sub-exposures per point when `exposure` is given.
   * @default ceil(exposure / 120 s), rounded up to the next odd number
   */
  supersample?: number;
}

/** Options for {@link addRmAnomaly}. */
export interface AddRmAnomalyOptions {
  /** Receives the anomaly (m/s), added to what is already there. */
  out: Float64Array;
  /**
   * Number of leading entries of `times` to process.
   * @default times.length
   */
  count?: number;
}

/** Seconds per day, for the exposure time. */
const SECONDS_PER_DAY = 86400;
/** Default sub-exposure length (seconds) when `supersample` is not given. */
const DEFAULT_SUBEXPOSURE = 120;
const TWO_PI = 2 * Math.PI;

/**
 * Add the Rossiter–McLaughlin anomaly (m/s, positive = receding) at each of
 * `times` (days) to `options.out`. Points where the planet's disk does not
 * overlap the stellar disk, or where the planet is behind the star, are left
 * untouched; a cheap mean-anomaly window test rejects most of them before any
 * Kepler solve. See the module documentation for the geometry, sign
 * convention and method.
 *
 * Invalid parameters (period ≤ 0, e outside [0, 1), a/R★ (1 − e) ≤ 1,
 * Rp/R★ outside [0, 1), b < 0, v sin i★ < 0, an impact parameter that needs
 * cos i > 1, limb darkening with non-positive total flux, or any non-finite
 * value) add `NaN` to every processed entry. A non-finite time adds `NaN` to
 * its entry. Limb-darkening coefficients are not checked for a non-negative
 * intensity everywhere (u1 > 0, u1 + u2 < 1, u1 + 2 u2 > 0; Kipping 2013,
 * MNRAS 435, 2152, recalled): that belongs in the priors. Allocates nothing.
 *
 * @throws {RangeError} when `count` exceeds `times.length` or `out.length`, or
 * `exposure` / `supersample` are invalid.
 *
 * @example
 * ```ts
 * const times = new Float64Array([0.99, 1.0, 1.01]);
 * const out = new Float64Array(3);
 * addRmAnomaly(times, {
 *   period: 3, timeConjunction: 1, eccentricity: 0, argPeriastron: Math.PI / 2,
 *   lambda: 0, vsini: 5, radiusRatio: 0.1, aOverRstar: 8, impact: 0.3, u1: 0.4, u2: 0.2,
 * }, { out });
 * ```
 */
export function addRmAnomaly(
  times: Float64Array,
  params: RmParams,
  options: AddRmAnomalyOptions,
): void {
  const out = options.out;
  const count = options.count ?? times.length;
  if (!(Number.isInteger(count) && count >= 0 && count <= times.length && count <= out.length)) {
    throw new RangeError(
      `Cannot add RM anomaly as count must be an integer within times and out: count=${count}, times=${times.length}, out=${out.length}`,
    );
  }
  const subCount = subexposureCount(params.exposure, params.supersample);
  const exposureDays = subCount > 1 ? (params.exposure as number) / SECONDS_PER_DAY : 0;

  if (!setGeometry(params)) {
    for (let i = 0; i < count; i++) out[i] = out[i]! + NaN;
    return;
  }
  for (let i = 0; i < count; i++) {
    const t = times[i]!;
    if (!Number.isFinite(t)) {
      out[i] = out[i]! + NaN;
      continue;
    }
    if (subCount === 1) {
      out[i] = out[i]! + anomalyAt(t);
    } else {
      let sum = 0;
      for (let j = 0; j < subCount; j++) {
        sum += anomalyAt(t + ((j + 0.5) / subCount - 0.5) * exposureDays);
      }
      out[i] = out[i]! + sum / subCount;
    }
  }
}

/** Number of sub-exposures; 1 when there is no exposure smearing. */
function subexposureCount(exposure: number | undefined, supersample: number | undefined): number {
  if (exposure === undefined) return 1;
  if (!(Number.isFinite(exposure) && exposure >= 0)) {
    throw new RangeError(
      `Cannot smear RM anomaly as exposure must be finite and non-negative: exposure=${exposure}`,
    );
  }
  if (exposure === 0) return 1;
  if (supersample !== undefined) {
    if (!(Number.isInteger(supersample) && supersample >= 1)) {
      throw new RangeError(
        `Cannot smear RM anomaly as supersample must be a positive integer: supersample=${supersample}`,
      );
    }
    return supersample;
  }
  const n = Math.ceil(exposure / DEFAULT_SUBEXPOSURE);
  return n % 2 === 0 ? n + 1 : n;
}

// Per-call geometry, kept in module scope so the per-point function allocates
// nothing and takes one argument. Set by setGeometry, read by anomalyAt.
let gMeanMotion = 0; // 2π / P (rad/day)
let gTc = 0; // time of conjunction (days)
let gMeanAnomalyTc = 0; // mean anomaly at conjunction (rad)
let gWindowOffset = 0; // M(Tc) − M(window start), rad
let gWindowWidth = TWO_PI; // width of the transit window in mean anomaly (rad)
let gE = 0; // eccentricity
let gSqrtOneMinusE2 = 1;
let gA = 0; // a/R★
let gCosW = 0;
let gSinW = 1;
let gCosI = 0;
let gK = 0; // Rp/R★
let gU1 = 0;
let gU2 = 0;
let gFlux = Math.PI; // total stellar flux
let gVelocityX = 0; // 1000 · v sin i · cos λ (m/s per stellar radius)
let gVelocityY = 0; // −1000 · v sin i · sin λ
const MOMENT = new Float64Array(1);
const ANOMALY = new Float64Array(2); // scratch: sin E, cos E

/** Validate `params` and fill the module geometry; false when invalid. */
function setGeometry(params: RmParams): boolean {
  const period = params.period;
  const e = params.eccentricity;
  const omega = params.argPeriastron;
  const a = params.aOverRstar;
  const k = params.radiusRatio;
  const b = params.impact;
  const vsini = params.vsini;
  const lambda = params.lambda;
  const u1 = params.u1;
  const u2 = params.u2;
  if (
    !(period > 0 && period < Infinity) || !Number.isFinite(params.timeConjunction) ||
    !(e >= 0 && e < 1) || !Number.isFinite(omega) || !Number.isFinite(lambda) ||
    !(vsini >= 0 && vsini < Infinity) || !(k >= 0 && k < 1) || !(b >= 0 && b < Infinity) ||
    !(a < Infinity && a * (1 - e) > 1) || !Number.isFinite(u1) || !Number.isFinite(u2)
  ) {
    return false;
  }
  const flux = stellarFlux(u1, u2);
  if (!(flux > 0)) return false;
  const sinW = Math.sin(omega);
  const cosW = Math.cos(omega);
  // Winn (2010), arXiv:1001.2010, eq. 7: b = (a cos i / R★)(1 − e²)/(1 + e sin ω).
  const cosI = (b * (1 + e * sinW)) / (a * (1 - e * e));
  if (!(cosI <= 1)) return false;

  gMeanMotion = TWO_PI / period;
  gTc = params.timeConjunction;
  gE = e;
  gSqrtOneMinusE2 = Math.sqrt(1 - e * e);
  gA = a;
  gCosW = cosW;
  gSinW = sinW;
  gCosI = cosI;
  gK = k;
  gU1 = u1;
  gU2 = u2;
  gFlux = flux;
  gVelocityX = 1000 * vsini * Math.cos(lambda);
  gVelocityY = -1000 * vsini * Math.sin(lambda);

  // Conjunction at true anomaly ν_c = π/2 − ω (Winn 2010, Sect. 2).
  const trueAnomalyTc = Math.PI / 2 - omega;
  gMeanAnomalyTc = meanAnomalyFromTrue(trueAnomalyTc, e);
  // Transit window: the sky separation d ≥ r |cos(ω + ν)| ≥ a (1 − e) |cos(ω + ν)|,
  // so overlap (d < 1 + k) on the near side needs |ω + ν − π/2| < asin((1 + k)/(a(1 − e))).
  // Mapped to mean anomaly (ν ↦ M is increasing) this is an exact superset.
  const s = (1 + k) / (a * (1 - e));
  if (s < 1) {
    const delta = Math.asin(s);
    const start = meanAnomalyFromTrue(trueAnomalyTc - delta, e);
    const end = meanAnomalyFromTrue(trueAnomalyTc + delta, e);
    gWindowWidth = positiveModulo(end - start) + 1e-9;
    gWindowOffset = gMeanAnomalyTc - start;
  } else {
    gWindowWidth = TWO_PI;
    gWindowOffset = 0;
  }
  return true;
}

/** The anomaly (m/s) at one time, from the module geometry. */
function anomalyAt(t: number): number {
  const dm = gMeanMotion * (t - gTc);
  if (gWindowWidth < TWO_PI && positiveModulo(dm + gWindowOffset) > gWindowWidth) return 0;
  const e = gE;
  eccentricAnomaly(gMeanAnomalyTc + dm, e, ANOMALY);
  const sinE = ANOMALY[0]!;
  const cosE = ANOMALY[1]!;
  // r cos ν = a (cos E − e), r sin ν = a √(1 − e²) sin E (Murray & Dermott 1999,
  // Solar System Dynamics, eqs. 2.41–2.42; recalled).
  const rCosNu = gA * (cosE - e);
  const rSinNu = gA * gSqrtOneMinusE2 * sinE;
  const rCosU = rCosNu * gCosW - rSinNu * gSinW; // r cos(ω + ν)
  const rSinU = rSinNu * gCosW + rCosNu * gSinW; // r sin(ω + ν)
  if (!(rSinU > 0)) return 0; // planet behind the star (Z ≤ 0)
  // Winn (2010) eqs. 2–3.
  const x = -rCosU;
  const y = -rSinU * gCosI;
  const d = Math.sqrt(x * x + y * y);
  if (!(d < 1 + gK) || d === 0) return 0;
  const f0 = occultedMoments(d, gK, gU1, gU2, MOMENT);
  const f1 = MOMENT[0]!;
  // ΔV = −(∫ I v dA over hidden)/(F★ − F0), v = vsini (X cos λ − Y sin λ).
  return (-f1 * (gVelocityX * x + gVelocityY * y)) / (d * (gFlux - f0));
}

/** x mod 2π in [0, 2π). */
function positiveModulo(x: number): number {
  const r = x - TWO_PI * Math.floor(x / TWO_PI);
  return r >= TWO_PI ? 0 : r;
}

/**
 * Mean anomaly of true anomaly ν: E = 2 atan2(√(1 − e) sin(ν/2), √(1 + e) cos(ν/2)),
 * M = E − e sin E (Murray & Dermott 1999, eqs. 2.46 and 2.52; recalled).
 */
function meanAnomalyFromTrue(trueAnomaly: number, e: number): number {
  const ecc = 2 *
    Math.atan2(
      Math.sqrt(1 - e) * Math.sin(trueAnomaly / 2),
      Math.sqrt(1 + e) * Math.cos(trueAnomaly / 2),
    );
  return ecc - e * Math.sin(ecc);
}

/**
 * Kepler's equation E − e sin E = M (Murray & Dermott 1999, eq. 2.52) by Newton
 * iteration safeguarded with bisection. For M reduced to [0, π] the root lies in
 * [M, min(M + e, π)] since 0 ≤ e sin E ≤ e; Newton steps that leave the bracket
 * are replaced by bisection, so convergence is guaranteed for 0 ≤ e < 1. Starts
 * from E₀ = M + 0.85 e (Danby 1988, Fundamentals of Celestial Mechanics, 2nd ed.,
 * Sect. 6.6; recalled). Writes
 * sin E, cos E to out[0], out[1].
 */
function eccentricAnomaly(meanAnomaly: number, e: number, out: Float64Array): void {
  let m = meanAnomaly - TWO_PI * Math.round(meanAnomaly / TWO_PI); // [−π, π]
  const sign = m < 0 ? -1 : 1;
  m *= sign;
  let ecc = m;
  if (e > 0 && m > 0) {
    let lo = m;
    let hi = m + e < Math.PI ? m + e : Math.PI;
    ecc = m + 0.85 * e < hi ? m + 0.85 * e : hi;
    for (let iteration = 0; iteration < 100; iteration++) {
      const f = ecc - e * Math.sin(ecc) - m;
      if (f === 0) break;
      if (f > 0) hi = ecc;
      else lo = ecc;
      let next = ecc - f / (1 - e * Math.cos(ecc));
      if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
      const step = Math.abs(next - ecc);
      ecc = next;
      if (step < 1e-14) break;
    }
  }
  out[0] = sign * Math.sin(ecc);
  out[1] = Math.cos(ecc);
}
