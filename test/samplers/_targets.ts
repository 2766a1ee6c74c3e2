/**
 * Test targets for the sampler, as factories for `LogDensitySource`
 * (`(payload) => (theta) => logDensity`, additive constants dropped). The
 * module is imported by the calling thread and by each evaluation worker.
 * @module
 */

import type { LogDensitySource } from "../../samplers/mod.ts";

/** A `LogDensitySource` pointing at an export of this module. */
export function targetSource(exportName: string, payload: unknown): LogDensitySource {
  return { moduleUrl: import.meta.url, exportName, payload };
}

/**
 * Lower Cholesky factor L (row-major, n × n) of a symmetric positive-definite
 * matrix, Σ = L Lᵀ, by the Cholesky–Banachiewicz recurrence (Golub & Van Loan,
 * Matrix Computations, 4th ed., 2013, Algorithm 4.2.1 in its row form; recalled
 * from memory).
 */
export function choleskyLower(matrix: Float64Array, n: number): Float64Array {
  const l = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let sum = matrix[i * n + j]!;
      for (let k = 0; k < j; k++) sum -= l[i * n + k]! * l[j * n + k]!;
      if (i === j) {
        if (!(sum > 0)) {
          throw new RangeError(`Cannot factor matrix as it is not positive definite: row=${i}`);
        }
        l[i * n + i] = Math.sqrt(sum);
      } else {
        l[i * n + j] = sum / l[j * n + j]!;
      }
    }
  }
  return l;
}

/** Payload of {@linkcode gaussian}. */
export interface GaussianPayload {
  mean: number[];
  /** Lower Cholesky factor of the covariance, row-major. */
  cholesky: number[];
  /** Extra sin/cos pairs per evaluation to make the density artificially expensive (benchmarks). @default 0 */
  work?: number;
}

/**
 * Multivariate normal N(mean, L Lᵀ): ln p = −½ |r|², r = L⁻¹ (θ − mean) by
 * forward substitution (the normalising constant is dropped).
 */
export function gaussian(payload: GaussianPayload): (theta: Float64Array) => number {
  const n = payload.mean.length;
  const mean = Float64Array.from(payload.mean);
  const l = Float64Array.from(payload.cholesky);
  const r = new Float64Array(n);
  const work = payload.work ?? 0;
  return (theta) => {
    let quad = 0;
    for (let i = 0; i < n; i++) {
      let s = theta[i]! - mean[i]!;
      for (let k = 0; k < i; k++) s -= l[i * n + k]! * r[k]!;
      const ri = s / l[i * n + i]!;
      r[i] = ri;
      quad += ri * ri;
    }
    let burn = 0;
    for (let k = 0; k < work; k++) burn += Math.sin(theta[0]! + k) * Math.cos(theta[1 % n]! - k);
    // burn * 0 keeps the work from being optimised away without changing the value (burn is finite).
    return -0.5 * quad + burn * 0;
  };
}

/** Payload of {@linkcode twistedGaussian}. */
export interface TwistedPayload {
  /** Twist b. */
  b: number;
  /** Number of dimensions (≥ 2). */
  dimensions: number;
  /** Variance of the first coordinate before twisting (100 in Haario et al.). */
  variance1: number;
}

/**
 * The "twisted Gaussian" banana of Haario, Saksman & Tamminen (1999), Comput.
 * Stat. 14, 375 (their test target; recalled from memory): f_b = f ∘ φ_b with
 * f = N(0, diag(variance1, 1, …, 1)) and φ_b(θ) = (θ1, θ2 + b θ1² − variance1 · b, θ3, …).
 * φ_b has unit Jacobian, so f_b is normalised and φ_b(θ) ~ f when θ ~ f_b.
 */
export function twistedGaussian(payload: TwistedPayload): (theta: Float64Array) => number {
  const { b, dimensions, variance1 } = payload;
  return (theta) => {
    const t1 = theta[0]!;
    const y2 = theta[1]! + b * t1 * t1 - variance1 * b;
    let quad = (t1 * t1) / variance1 + y2 * y2;
    for (let d = 2; d < dimensions; d++) quad += theta[d]! * theta[d]!;
    return -0.5 * quad;
  };
}

/** Payload of {@linkcode gaussianMixture}. */
export interface MixturePayload {
  /** Weight of component A (B has 1 − weight). */
  weight: number;
  meanA: number[];
  meanB: number[];
  /** Common isotropic standard deviation. */
  sigma: number;
}

/** Two-component isotropic Gaussian mixture w N(meanA, σ²I) + (1 − w) N(meanB, σ²I), by log-sum-exp. */
export function gaussianMixture(payload: MixturePayload): (theta: Float64Array) => number {
  const { weight, meanA, meanB, sigma } = payload;
  const n = meanA.length;
  const logA = Math.log(weight);
  const logB = Math.log(1 - weight);
  return (theta) => {
    let qa = 0;
    let qb = 0;
    for (let d = 0; d < n; d++) {
      const ra = (theta[d]! - meanA[d]!) / sigma;
      const rb = (theta[d]! - meanB[d]!) / sigma;
      qa += ra * ra;
      qb += rb * rb;
    }
    const a = logA - 0.5 * qa;
    const c = logB - 0.5 * qb;
    const m = Math.max(a, c);
    return m + Math.log(Math.exp(a - m) + Math.exp(c - m));
  };
}

/** Standard normal restricted to θ0 ≥ 0 (−Infinity elsewhere): exercises the redraw at start. */
export function halfSpace(payload: { dimensions: number }): (theta: Float64Array) => number {
  return (theta) => {
    if (theta[0]! < 0) return -Infinity;
    let quad = 0;
    for (let d = 0; d < payload.dimensions; d++) quad += theta[d]! * theta[d]!;
    return -0.5 * quad;
  };
}

/** −Infinity everywhere. */
export function nowhere(_payload: unknown): (theta: Float64Array) => number {
  return () => -Infinity;
}

/** Throws when θ0 > threshold, else a standard normal. */
export function throwsAbove(payload: { threshold: number }): (theta: Float64Array) => number {
  return (theta) => {
    if (theta[0]! > payload.threshold) throw new RangeError(`theta0 too large: theta0=${theta[0]}`);
    return -0.5 * theta[0]! * theta[0]!;
  };
}

/** Returns the number of entries it was given (checks theta has exactly D entries). */
export function lengthOf(_payload: unknown): (theta: Float64Array) => number {
  return (theta) => theta.length;
}

/** Returns Σ_d sin((d + 1) θ_d): a cheap deterministic function of every entry. */
export function sumOf(_payload: unknown): (theta: Float64Array) => number {
  return (theta) => {
    let s = 0;
    for (let d = 0; d < theta.length; d++) s += Math.sin(theta[d]! * (d + 1));
    return s;
  };
}

/**
 * The correlated Gaussian test case: mean_i = i − (D − 1)/2, standard
 * deviations sd_i = 10^((i − 5)/5) (0.1 … 6.3 for D = 10) and correlation
 * 0.8^|i − j| (an AR(1)-type matrix, positive definite for |ρ| < 1), so the
 * covariance spans three decades of scale and strong correlations.
 */
export function correlatedGaussianCase(dims: number, work = 0): {
  mean: Float64Array;
  covariance: Float64Array;
  source: LogDensitySource;
} {
  const mean = new Float64Array(dims);
  const sd = new Float64Array(dims);
  for (let i = 0; i < dims; i++) {
    mean[i] = i - (dims - 1) / 2;
    sd[i] = 10 ** ((i - 5) / 5);
  }
  const covariance = new Float64Array(dims * dims);
  for (let i = 0; i < dims; i++) {
    for (let j = 0; j < dims; j++) {
      covariance[i * dims + j] = sd[i]! * sd[j]! * 0.8 ** Math.abs(i - j);
    }
  }
  const cholesky = choleskyLower(covariance, dims);
  const payload: GaussianPayload = { mean: Array.from(mean), cholesky: Array.from(cholesky), work };
  return { mean, covariance, source: targetSource("gaussian", payload) };
}
