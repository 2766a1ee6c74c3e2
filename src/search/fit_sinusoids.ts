/**
 * Linear least-squares fit of sinusoids at fixed periods, with instrument
 * offsets and a trend.
 * @module
 */
import { type RvSeries, timeRange, validateSeries } from "./_series.ts";
import { SinusoidFitter } from "./_sinusoid_fitter.ts";

/** Options of {@linkcode fitSinusoids}. */
export interface FitSinusoidsOptions {
  /** Polynomial trend degree (0 = none). @default 0 */
  trendDegree?: number;
  /** One free offset per instrument. @default true */
  offsets?: boolean;
  /** Jitter added in quadrature to rvErr, m/s. @default 0 */
  jitter?: number;
  /** Reference epoch of phases and trend, days. @default midpoint of the time range */
  referenceTime?: number;
}

/** One fitted sinusoid v(t) = K cos(2 pi (t - referenceTime)/P - phase). */
export interface FittedSinusoid {
  /** Period P, days. */
  readonly period: number;
  /** Semi-amplitude K >= 0, m/s. */
  readonly semiAmplitude: number;
  /** Phase, radians in (-pi, pi], of the cosine about referenceTime. */
  readonly phase: number;
  /**
   * Time of conjunction of a circular orbit, v(t) = -K sin(2 pi (t - Tc)/P)
   * (v = K [cos(nu + omega) + e cos omega] with e = 0, nu + omega = pi/2 at
   * conjunction), chosen within half a period of referenceTime, days.
   */
  readonly timeOfConjunction: number;
}

/** Result of {@linkcode fitSinusoids}. */
export interface SinusoidFitResult {
  /** Weighted chi^2 = sum (rv - model)^2 / (sigma^2 + jitter^2). */
  readonly chi2: number;
  /** Reference epoch, days. */
  readonly referenceTime: number;
  /** Offset per instrument, m/s (NaN for instruments without points or when offsets are off). */
  readonly offsets: Float64Array;
  /** Trend coefficients c_j of sum_j c_j (t - referenceTime)^j, j = 1..degree, m/s/d^j. */
  readonly trend: Float64Array;
  /** One entry per period, in input order. */
  readonly sinusoids: FittedSinusoid[];
  /** rv minus the full model (offsets, trend and sinusoids), m/s. */
  readonly residuals: Float64Array;
}

/**
 * Weighted least-squares fit of y = offsets + trend + sum_m [a_m cos + b_m sin]
 * at the given periods (direct normal equations, see `_sinusoid_fitter.ts`).
 * K_m = sqrt(a_m^2 + b_m^2), phase_m = atan2(b_m, a_m).
 *
 * Returns chi2 = NaN and NaN coefficients when the design is singular (two
 * equal periods, too few points). Throws on malformed series or non-positive
 * periods.
 */
export function fitSinusoids(
  series: RvSeries,
  periods: ArrayLike<number>,
  options: FitSinusoidsOptions = {},
): SinusoidFitResult {
  validateSeries(series, "fit sinusoids");
  const m = periods.length;
  const frequencies = new Float64Array(m);
  for (let j = 0; j < m; j++) {
    const p = periods[j]!;
    if (!(p > 0) || !Number.isFinite(p)) {
      throw new RangeError(
        `Cannot fit sinusoids as periods must be positive: index=${j}, period=${p}`,
      );
    }
    frequencies[j] = 1 / p;
  }
  const trendDegree = options.trendDegree ?? 0;
  if (!Number.isInteger(trendDegree) || trendDegree < 0) {
    throw new RangeError(
      `Cannot fit sinusoids as trendDegree must be a non-negative integer: trendDegree=${trendDegree}`,
    );
  }
  const [t0, t1] = timeRange(series.time, series.count);
  const tRef = options.referenceTime ?? 0.5 * (t0 + t1);
  const fitter = new SinusoidFitter(series, {
    trendDegree,
    offsets: options.offsets ?? true,
    jitter: options.jitter ?? 0,
    tRef,
    tScale: Math.max(0.5 * (t1 - t0), Math.abs(tRef - t0), Math.abs(t1 - tRef), 1e-300),
    maxSinusoids: m,
  });
  return fitter.describe(frequencies, m);
}
