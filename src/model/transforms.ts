/**
 * Maps between the physical parameters the user's priors are written on and the
 * sampler's internal coordinates, with the log-Jacobians that make the prior
 * the user wrote the prior sampled.
 *
 * Change of variables (any probability text, e.g. Gelman et al. 2013, Bayesian
 * Data Analysis 3rd ed., §1.8): if x = g(u), the density of u is
 * p_u(u) = p_x(g(u)) |det ∂g/∂u|, so the sampler's target in u adds
 * ln |det ∂g/∂u| to the log-prior.
 * @module
 */
import { logPriorDensity, type Prior, priorSupport } from "./priors.ts";

/** Scalar transform kinds: internal u = x, or u = ln x for x > 0. */
export type ScalarTransform = "identity" | "log";

/**
 * Physical value from internal: identity x = u; log x = eᵘ.
 */
export function toPhysical(kind: ScalarTransform, internal: number): number {
  return kind === "log" ? Math.exp(internal) : internal;
}

/**
 * Internal value from physical: identity u = x; log u = ln x (`NaN` for x < 0,
 * `-Infinity` at 0).
 */
export function toInternal(kind: ScalarTransform, physical: number): number {
  return kind === "log" ? Math.log(physical) : physical;
}

/**
 * ln |dx/du| at internal u: 0 for identity; for log, x = eᵘ so dx/du = eᵘ and
 * the log-Jacobian is u.
 */
export function logJacobian(kind: ScalarTransform, internal: number): number {
  return kind === "log" ? internal : 0;
}

/**
 * Log-prior density of the internal coordinate u:
 * ln p_x(x(u)) + ln |dx/du|. `-Infinity` outside the prior's support.
 */
export function internalLogPrior(prior: Prior, kind: ScalarTransform, internal: number): number {
  const lp = logPriorDensity(prior, toPhysical(kind, internal));
  return lp === -Infinity ? lp : lp + logJacobian(kind, internal);
}

/**
 * ln |∂(e, ω)/∂(h, k)| for the pair h = √e cos ω, k = √e sin ω.
 *
 * Derivation: ∂(h, k)/∂(e, ω) has rows (cos ω/(2√e), −√e sin ω) and
 * (sin ω/(2√e), √e cos ω); its determinant is cos²ω/2 + sin²ω/2 = 1/2. Hence
 * |∂(e, ω)/∂(h, k)| = 2 everywhere (e > 0), and
 * ln p(h, k) = ln p_e(h² + k²) + ln p_ω(ω) + ln 2. The constant does not change
 * what a sampler draws but keeps the density normalised. (Parametrisation as in
 * Eastman, Gaudi & Agol 2013, PASP 125, 83, who use √e cos ω, √e sin ω so
 * that uniform priors in (h, k) give uniform e; recalled from memory.)
 */
export const SQRT_ECC_LOG_JACOBIAN = Math.LN2;

/** Options for {@link fromSqrtEccentricity}. */
export interface FromSqrtEccentricityOptions {
  /** Receives e at index 0 and ω at index 1 (radians). */
  out: Float64Array;
  /**
   * ω is wrapped into [omegaLow, omegaLow + 2π). Use the lower bound of ω's
   * prior when that prior spans 2π (e.g. 0 for [0, 2π]). @default −π
   */
  omegaLow?: number;
}

const TWO_PI = 2 * Math.PI;

/**
 * (h, k) = (√e cos ω, √e sin ω) → (e, ω), written into `options.out`. e may be
 * ≥ 1 (the eccentricity prior then gives `-Infinity`). At h = k = 0, ω is
 * atan2(0, 0) = 0 wrapped into the window (a set of measure zero). Allocates nothing when the options
 * object is reused.
 */
export function fromSqrtEccentricity(
  h: number,
  k: number,
  options: FromSqrtEccentricityOptions,
): void {
  const low = options.omegaLow ?? -Math.PI;
  let omega = Math.atan2(k, h);
  omega -= TWO_PI * Math.floor((omega - low) / TWO_PI);
  if (omega >= low + TWO_PI) omega -= TWO_PI; // guard rounding at the edge
  options.out[0] = h * h + k * k;
  options.out[1] = omega;
}

/** (e, ω) → (h, k) = (√e cos ω, √e sin ω), written into `options.out`. */
export function toSqrtEccentricity(
  eccentricity: number,
  argPeriastron: number,
  options: { out: Float64Array },
): void {
  const r = Math.sqrt(eccentricity);
  options.out[0] = r * Math.cos(argPeriastron);
  options.out[1] = r * Math.sin(argPeriastron);
}

/**
 * Log-prior density of the internal pair (h, k) given priors on e and ω:
 * ln p_e(e) + ln p_ω(ω) + ln 2, with ω wrapped into
 * [omegaLow, omegaLow + 2π) where omegaLow is the lower end of ω's prior support
 * when finite, μ − π for a normal prior, else −π ({@link omegaWindowLow}). Exact when ω's prior support lies within one 2π window
 * (a uniform prior on [0, 2π], or a normal prior narrow against π); a wider ω
 * prior is in effect folded onto that window. `-Infinity` for e ≥ 1.
 * Uses module scratch: allocation-free, not re-entrant (plain JS is not).
 */
export function sqrtEccentricityLogPrior(
  h: number,
  k: number,
  options: { eccentricityPrior: Prior; argPeriastronPrior: Prior },
): number {
  const low = omegaWindowLow(options.argPeriastronPrior);
  PAIR_OPTIONS.omegaLow = low;
  fromSqrtEccentricity(h, k, PAIR_OPTIONS);
  const e = PAIR[0]!;
  if (!(e < 1)) return -Infinity;
  const lp = logPriorDensity(options.eccentricityPrior, e) +
    logPriorDensity(options.argPeriastronPrior, PAIR[1]!);
  return lp === -Infinity ? lp : lp + SQRT_ECC_LOG_JACOBIAN;
}

/** Lower end of the 2π window ω is wrapped into for a given ω prior. */
export function omegaWindowLow(argPeriastronPrior: Prior): number {
  const lo = priorSupport(argPeriastronPrior)[0];
  if (Number.isFinite(lo)) return lo;
  if (argPeriastronPrior.kind === "normal") return argPeriastronPrior.mu - Math.PI;
  return -Math.PI;
}

const PAIR = new Float64Array(2);
const PAIR_OPTIONS: FromSqrtEccentricityOptions = { out: PAIR, omegaLow: -Math.PI };
