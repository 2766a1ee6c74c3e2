/**
 * Gaussian RV likelihood with per-instrument offsets and jitter, an optional
 * linear/quadratic trend, and the fused Keplerian + likelihood kernel the
 * compiled model calls once per posterior evaluation.
 * @module
 */
import type { Days } from "../units.ts";
import { addKeplerianRv, type Orbit } from "./keplerian.ts";

/** RV observations, sorted or not, all arrays at least `count` long. */
export interface RvData {
  /** Observation times (days). */
  time: Float64Array;
  /** Measured RVs (m/s). */
  rv: Float64Array;
  /** 1σ measurement errors (m/s, > 0). */
  rvErr: Float64Array;
  /** Index into the instrument list, per point. */
  instrument: Int32Array;
  /** Number of points used. */
  count: number;
}

/** Options for {@link gaussianLogLikelihood}. */
export interface GaussianLogLikelihoodOptions {
  /** Predicted RV per point, including offsets and trend (m/s). */
  model: Float64Array;
  /** Jitter per instrument (m/s), added in quadrature to the errors. */
  jitter: Float64Array;
}

const LN_TWO_PI = Math.log(2 * Math.PI);

/**
 * Gaussian log-likelihood with full normalisation,
 *
 *   ln L = −½ Σᵢ [ (yᵢ − mᵢ)²/σᵢ² + ln(2π σᵢ²) ],  σᵢ² = errᵢ² + jitter²_inst(i)
 *
 * (independent normal errors; e.g. Gregory 2005, Bayesian Logical Data Analysis
 * for the Physical Sciences, §4.8; common practice). Returns `-Infinity` when a
 * variance is not positive or the result is `NaN` (for example a `NaN` model).
 * Jitter enters squared, so its sign is irrelevant.
 */
export function gaussianLogLikelihood(
  data: RvData,
  options: GaussianLogLikelihoodOptions,
): number {
  return logLikelihoodCore(data, options.model, options.jitter);
}

function logLikelihoodCore(data: RvData, model: Float64Array, jitter: Float64Array): number {
  const rv = data.rv;
  const err = data.rvErr;
  const inst = data.instrument;
  const count = data.count;
  let chi2 = 0;
  let logVar = 0;
  // Σ ln σᵢ² = ln Π σᵢ²: one log per ~40 points instead of one per point
  // (common practice, no source). Factors in [1e-100, 1e100] enter the product,
  // which is logged and reset once outside [1e-100, 1e100], so it never leaves
  // [1e-200, 1e200]; other variances are logged alone.
  let product = 1;
  for (let i = 0; i < count; i++) {
    const s = err[i]!;
    const j = jitter[inst[i]!]!;
    const variance = s * s + j * j;
    const r = rv[i]! - model[i]!;
    chi2 += r * r / variance;
    if (variance > 1e-100 && variance < 1e100) {
      product *= variance;
      if (product > 1e100 || product < 1e-100) {
        logVar += Math.log(product);
        product = 1;
      }
    } else {
      logVar += variance > 0 ? Math.log(variance) : NaN;
    }
  }
  logVar += Math.log(product);
  const result = -0.5 * (chi2 + logVar + count * LN_TWO_PI);
  return result === result && result !== Infinity ? result : -Infinity;
}

/** A polynomial trend about a reference time. */
export interface Trend {
  /** Reference time t₀ (days). */
  referenceTime: Days;
  /** Linear coefficient (m/s per day). */
  linear: number;
  /** Quadratic coefficient (m/s per day²). */
  quadratic: number;
}

/** Options for {@link addTrend}. */
export interface AddTrendOptions extends Trend {
  /** The trend at `times[i]` is added to `out[i]`. */
  out: Float64Array;
  /** Number of points. @default times.length */
  count?: number;
}

/**
 * Add γ̇ (t − t₀) + γ̈ (t − t₀)² into `options.out` (common practice, no source).
 * Allocates nothing.
 */
export function addTrend(times: Float64Array, options: AddTrendOptions): void {
  const out = options.out;
  const count = options.count ?? times.length;
  const t0 = options.referenceTime;
  const lin = options.linear;
  const quad = options.quadratic;
  for (let i = 0; i < count; i++) {
    const dt = times[i]! - t0;
    out[i] = out[i]! + dt * (lin + quad * dt);
  }
}

/** Options for {@link addOffsets}. */
export interface AddOffsetsOptions {
  /** `offsets[instrument[i]]` is added to `out[i]`. */
  out: Float64Array;
  /** Number of points. @default instrument.length */
  count?: number;
}

/**
 * Add each point's instrument offset (m/s) into `options.out`. Points whose
 * instrument index has no offset get `NaN`. Allocates nothing.
 */
export function addOffsets(
  instrument: Int32Array,
  offsets: Float64Array,
  options: AddOffsetsOptions,
): void {
  const out = options.out;
  const count = options.count ?? instrument.length;
  for (let i = 0; i < count; i++) {
    out[i] = out[i]! + (offsets[instrument[i]!] ?? NaN);
  }
}

/** Parameters of {@link rvLogLikelihood}. */
export interface RvLikelihoodParams {
  /** Planets; their RVs add (no interaction). */
  orbits: readonly Orbit[];
  /** Offset per instrument (m/s). */
  offsets: Float64Array;
  /** Jitter per instrument (m/s). */
  jitter: Float64Array;
  /** Polynomial trend; zero coefficients for none. */
  trend: Trend;
  /** Work buffer, at least `data.count` long; overwritten with the model RV. */
  scratch: Float64Array;
}

const KEPLER_OPTIONS: { out: Float64Array; count: number } = {
  out: new Float64Array(0),
  count: 0,
};

/**
 * Fused model + likelihood: writes the predicted RV (offsets + trend + every
 * orbit) into `params.scratch` and returns {@link gaussianLogLikelihood} of it.
 * Allocation-free; this is the per-evaluation kernel. Returns `-Infinity` for an
 * invalid orbit (eccentricity outside [0, 1), non-positive period), a
 * non-positive variance or any `NaN`.
 *
 * @throws {RangeError} when `scratch` is shorter than `data.count` (a
 * programming error at the boundary, not a bad parameter value).
 */
export function rvLogLikelihood(data: RvData, params: RvLikelihoodParams): number {
  const count = data.count;
  const model = params.scratch;
  if (model.length < count) {
    throw new RangeError(
      `Cannot evaluate likelihood as scratch is too short: scratch=${model.length}, count=${count}`,
    );
  }
  const times = data.time;
  const inst = data.instrument;
  const offsets = params.offsets;
  const t0 = params.trend.referenceTime;
  const lin = params.trend.linear;
  const quad = params.trend.quadratic;
  for (let i = 0; i < count; i++) {
    const dt = times[i]! - t0;
    model[i] = (offsets[inst[i]!] ?? NaN) + dt * (lin + quad * dt);
  }
  const opts = KEPLER_OPTIONS;
  opts.out = model;
  opts.count = count;
  const orbits = params.orbits;
  for (let p = 0; p < orbits.length; p++) {
    addKeplerianRv(times, orbits[p]!, opts);
  }
  opts.out = EMPTY; // do not keep the caller's buffer alive
  return logLikelihoodCore(data, model, params.jitter);
}

const EMPTY = new Float64Array(0);
