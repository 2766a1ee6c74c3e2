/**
 * Keplerian radial velocity of a star orbited by non-interacting planets, and the
 * conversion between time of periastron and time of inferior conjunction.
 * @module
 */
import type { Days, MetersPerSecond, Radians } from "../units.ts";
import { solveKeplerBatch, type SolveKeplerBatchOptions } from "./kepler.ts";

/** One planet's Keplerian orbit as seen in the star's reflex motion. */
export interface Orbit {
  /** Orbital period. */
  period: Days;
  /** A time of periastron passage. */
  timePeriastron: Days;
  /** RV semi-amplitude K (includes sin i). */
  semiAmplitude: MetersPerSecond;
  /** Eccentricity, 0 ≤ e < 1. */
  eccentricity: number;
  /** Argument of periastron ω of the star's orbit (the planet's is ω + π). */
  argPeriastron: Radians;
}

/** Options for {@link addKeplerianRv}. */
export interface AddKeplerianRvOptions {
  /** The RV of the orbit at `times[i]` is added to `out[i]`. */
  out: Float64Array;
  /** Number of points. @default times.length */
  count?: number;
}

const TWO_PI = 2 * Math.PI;
/** Points per chunk: mean anomalies → batch solver → RV, all in L1 cache. */
const CHUNK = 256;
const CHUNK_M = new Float64Array(CHUNK);
const CHUNK_SIN = new Float64Array(CHUNK);
const CHUNK_COS = new Float64Array(CHUNK);
const SOLVE_OPTIONS: SolveKeplerBatchOptions = { sinE: CHUNK_SIN, cosE: CHUNK_COS, count: 0 };

/**
 * Add the star's radial velocity due to one planet, in m/s, positive receding,
 *
 *   v(t) = K [cos(ν + ω) + e cos ω]
 *
 * (Lovis & Fischer 2010, "Radial Velocity Techniques for Exoplanets", in
 * Exoplanets, ed. S. Seager, Univ. of Arizona Press, §2; recalled from
 * memory), into `options.out`. ω is the argument of periastron of the star's orbit.
 *
 * Method: the mean anomaly M = 2π (t − t_p)/P goes through Kepler's equation
 * ({@link solveKepler}); then, without atan2, with
 * cos ν = (cos E − e)/(1 − e cos E) and sin ν = √(1 − e²) sin E/(1 − e cos E)
 * (Murray & Dermott 1999, Solar System Dynamics, §2.4; recalled from memory),
 *
 *   v = K [cos ω (cos E − e) − √(1 − e²) sin ω sin E]/(1 − e cos E) + K e cos ω.
 *
 * Invalid orbits (eccentricity outside [0, 1), non-positive or non-finite
 * period) add `NaN`. Allocates nothing.
 */
export function addKeplerianRv(
  times: Float64Array,
  orbit: Orbit,
  options: AddKeplerianRvOptions,
): void {
  const out = options.out;
  const count = options.count ?? times.length;
  const e = orbit.eccentricity;
  const period = orbit.period;
  if (!(e >= 0 && e < 1) || !(period > 0) || !Number.isFinite(period)) {
    for (let i = 0; i < count; i++) out[i] = NaN;
    return;
  }
  const k = orbit.semiAmplitude;
  const omega = orbit.argPeriastron;
  const cosW = Math.cos(omega);
  const sinW = Math.sin(omega);
  const a = k * cosW;
  const b = k * Math.sqrt((1 - e) * (1 + e)) * sinW;
  const c = k * e * cosW;
  const n = TWO_PI / period;
  const tp = orbit.timePeriastron;
  const mean = CHUNK_M;
  const sinE = CHUNK_SIN;
  const cosE = CHUNK_COS;
  const solveOptions = SOLVE_OPTIONS;
  for (let start = 0; start < count; start += CHUNK) {
    const len = Math.min(CHUNK, count - start);
    for (let j = 0; j < len; j++) mean[j] = n * (times[start + j]! - tp);
    solveOptions.count = len;
    solveKeplerBatch(mean, e, solveOptions);
    for (let j = 0; j < len; j++) {
      const s = sinE[j]!;
      const co = cosE[j]!;
      out[start + j] = out[start + j]! + (a * (co - e) - b * s) / (1 - e * co) + c;
    }
  }
}

/**
 * Time of periastron from a time of inferior conjunction of the planet (transit
 * time), where the star's true anomaly is ν_c = π/2 − ω.
 *
 * Method: E_c = 2 atan2(√(1 − e) sin(ν_c/2), √(1 + e) cos(ν_c/2)) (tan(E/2) =
 * √((1 − e)/(1 + e)) tan(ν/2), Murray & Dermott 1999, Solar System Dynamics, §2.4;
 * recalled from memory), M_c = E_c − e sin E_c (Kepler's equation), and
 * t_p = t_c − P M_c/(2π). The same recipe is used by Eastman, Gaudi & Agol 2013,
 * PASP 125, 83 (recalled from memory). The returned t_p lies within half a
 * period of t_c. Returns `NaN` for e outside [0, 1).
 */
export function timePeriastronFromConjunction(
  timeConjunction: Days,
  orbit: Pick<Orbit, "period" | "eccentricity" | "argPeriastron">,
): Days {
  return timeConjunction - orbit.period * meanAnomalyAtConjunction(orbit) / TWO_PI;
}

/**
 * Time of inferior conjunction (ν = π/2 − ω) from a time of periastron; inverse
 * of {@link timePeriastronFromConjunction}. Returns `NaN` for e outside [0, 1).
 */
export function timeConjunctionFromPeriastron(
  timePeriastron: Days,
  orbit: Pick<Orbit, "period" | "eccentricity" | "argPeriastron">,
): Days {
  return timePeriastron + orbit.period * meanAnomalyAtConjunction(orbit) / TWO_PI;
}

/** Mean anomaly M_c ∈ (−π, π] at inferior conjunction; see above. */
export function meanAnomalyAtConjunction(
  orbit: Pick<Orbit, "eccentricity" | "argPeriastron">,
): Radians {
  const e = orbit.eccentricity;
  if (!(e >= 0 && e < 1)) return NaN;
  const nu = Math.PI / 2 - orbit.argPeriastron;
  const eAnomaly = 2 *
    Math.atan2(Math.sqrt(1 - e) * Math.sin(nu / 2), Math.sqrt(1 + e) * Math.cos(nu / 2));
  let m = eAnomaly - e * Math.sin(eAnomaly);
  m -= TWO_PI * Math.round(m / TWO_PI);
  return m;
}
