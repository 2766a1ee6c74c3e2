/**
 * Iterative periodogram search: strongest peak, fit, subtract, repeat.
 * @module
 */
import type { Days } from "../units.ts";
import type { FittedSinusoid } from "./fit_sinusoids.ts";
import { falseAlarmProbability } from "./false_alarm.ts";
import { frequencyGrid } from "./frequency_grid.ts";
import { glsPeriodogram } from "./gls.ts";
import { nelderMead } from "./nelder_mead.ts";
import { type RvSeries, timeRange, validateSeries } from "./_series.ts";
import { SinusoidFitter } from "./_sinusoid_fitter.ts";

/** Options of {@linkcode searchSignals}. */
export interface SearchOptions {
  /** Shortest period searched, days. @default 1 */
  minPeriod?: Days;
  /** Longest period searched, days. @default the time span */
  maxPeriod?: Days;
  /** Frequency grid oversampling (df = 1/(oversample * span)). @default 5 */
  oversample?: number;
  /** Most signals to accept. @default 5 */
  maxSignals?: number;
  /** Accept a peak only if its false-alarm probability is <= this. @default 1e-3 */
  fapThreshold?: number;
  /** Polynomial trend degree fitted together with offsets at every step (0 = none). @default 0 */
  trendDegree?: number;
  /** Jitter added in quadrature to rvErr, m/s. @default 0 */
  jitter?: number;
  /** Refine all accepted frequencies jointly by Nelder–Mead on chi^2. @default true */
  refine?: boolean;
}

/** A signal accepted by {@linkcode searchSignals}. */
export interface FoundSignal extends FittedSinusoid {
  /** Frequency 1/period, 1/d. */
  readonly frequency: number;
  /** Periodogram power of the peak when it was found (relative chi^2 reduction). */
  readonly power: number;
  /** Baluev (2008) false-alarm probability of that peak. */
  readonly fap: number;
}

/** Strongest peak that was not accepted. */
export interface RejectedPeak {
  readonly period: number;
  readonly power: number;
  readonly fap: number;
}

/** Result of {@linkcode searchSignals}. */
export interface SearchResult {
  /** Accepted signals in the order found; K, phase and Tc are from the final joint fit. */
  readonly signals: FoundSignal[];
  /** Unweighted rms of the residuals of the final fit, sqrt(sum r^2 / N), m/s. */
  readonly residualRms: number;
  /** rv minus the final model (offsets, trend, all signals), m/s. */
  readonly residuals: Float64Array;
  /** Offset per instrument of the final fit, m/s. */
  readonly offsets: Float64Array;
  /** Trend coefficients of the final fit, m/s/d^j about referenceTime. */
  readonly trend: Float64Array;
  /** Reference epoch of phases and trend, days. */
  readonly referenceTime: number;
  /** Searched frequencies, 1/d (ascending). */
  readonly frequencies: Float64Array;
  /**
   * Periodogram of each step: periodograms[k] is the one in which signals[k]
   * was found; one more entry when the search stopped on the FAP threshold.
   */
  readonly periodograms: Float64Array[];
  /** The peak that stopped the search (FAP above threshold), or null if maxSignals was reached. */
  readonly nextPeak: RejectedPeak | null;
}

/**
 * Iterative ("prewhitening") search for periodic signals in RV data.
 *
 * Method (common practice in RV planet searches, e.g. Zechmeister & Kürster
 * 2009, Sect. 4; no single source for the loop):
 * 1. GLS periodogram (offsets, optional trend) of the current residuals on an
 *    evenly spaced grid (see frequencyGrid).
 * 2. Highest peak; its Baluev (2008) FAP with d_H = offsets + trend + 3 per
 *    signal already removed (amplitude, phase and frequency are fitted). If the
 *    FAP exceeds `fapThreshold` (default 1e-3, i.e. 0.1 %) the search stops.
 * 3. The peak frequency is refined by a parabola through the three highest
 *    grid points, then all accepted frequencies are refined jointly by
 *    Nelder–Mead on chi^2 of the full linear model (offsets + trend +
 *    sinusoids), each kept within 3 grid steps of its start.
 * 4. All sinusoids are refitted jointly with offsets and trend (linear least
 *    squares); the sinusoids are subtracted from the data to form the new
 *    residuals, and the loop repeats until `maxSignals`.
 *
 * Signals are sinusoids (circular orbits). A Keplerian refit is left to the
 * caller (the model's Kepler solver with {@linkcode nelderMead}).
 */
export function searchSignals(series: RvSeries, options: SearchOptions = {}): SearchResult {
  validateSeries(series, "search signals");
  const maxSignals = options.maxSignals ?? 5;
  const fapThreshold = options.fapThreshold ?? 1e-3;
  const trendDegree = options.trendDegree ?? 0;
  const jitter = options.jitter ?? 0;
  const refine = options.refine ?? true;
  if (!Number.isInteger(maxSignals) || maxSignals < 0) {
    throw new RangeError(
      `Cannot search signals as maxSignals must be an integer >= 0: maxSignals=${maxSignals}`,
    );
  }
  if (!(fapThreshold >= 0 && fapThreshold <= 1)) {
    throw new RangeError(
      `Cannot search signals as fapThreshold must be within [0, 1]: fapThreshold=${fapThreshold}`,
    );
  }
  const grid = frequencyGrid(series.time, {
    minPeriod: options.minPeriod,
    maxPeriod: options.maxPeriod,
    oversample: options.oversample,
    count: series.count,
  });
  const n = series.count;
  const [t0, t1] = timeRange(series.time, n);
  const fitter = new SinusoidFitter(series, {
    trendDegree,
    offsets: true,
    jitter,
    tRef: 0.5 * (t0 + t1),
    tScale: 0.5 * (t1 - t0),
    maxSinusoids: maxSignals,
  });

  const frequencies = new Float64Array(maxSignals);
  const found: { power: number; fap: number }[] = [];
  const periodograms: Float64Array[] = [];
  const residual = new Float64Array(n);
  residual.set(series.rv.subarray(0, n));
  const residualSeries: RvSeries = { ...series, rv: residual };
  let nextPeak: RejectedPeak | null = null;

  for (let k = 0; k <= maxSignals; k++) {
    if (n < fitter.columns(k) + 3 + k) break;
    const gls = glsPeriodogram(residualSeries, grid, { trendDegree, jitter });
    periodograms.push(gls.power);
    let best = -1, bestPower = -Infinity;
    for (let j = 0; j < grid.count; j++) {
      const p = gls.power[j]!;
      if (p > bestPower) {
        bestPower = p;
        best = j;
      }
    }
    if (best < 0) break;
    const fap = falseAlarmProbability(bestPower, gls, { extraParameters: 3 * k });
    if (k === maxSignals || !(fap <= fapThreshold)) {
      nextPeak = { period: 1 / grid.frequencies[best]!, power: bestPower, fap };
      break;
    }
    frequencies[k] = peakFrequency(gls.power, grid.frequencies, best, grid.step);
    found.push({ power: bestPower, fap });
    const m = k + 1;
    if (refine) {
      refineFrequencies(fitter, frequencies, m, grid.step, fitter.solve(frequencies, m));
    }
    fitter.solve(frequencies, m);
    for (let i = 0; i < n; i++) residual[i] = series.rv[i]! - fitter.model(i, m, true);
  }

  const m = found.length;
  const fit = fitter.describe(frequencies, m);
  let ss = 0;
  for (let i = 0; i < n; i++) ss += fit.residuals[i]! * fit.residuals[i]!;
  const signals: FoundSignal[] = fit.sinusoids.map((s, j) => ({
    ...s,
    frequency: frequencies[j]!,
    power: found[j]!.power,
    fap: found[j]!.fap,
  }));
  return {
    signals,
    residualRms: Math.sqrt(ss / n),
    residuals: fit.residuals,
    offsets: fit.offsets,
    trend: fit.trend,
    referenceTime: fit.referenceTime,
    frequencies: grid.frequencies,
    periodograms,
    nextPeak,
  };
}

/**
 * Vertex of the parabola through the grid maximum and its neighbours (common
 * practice, no source); stays within half a step of the grid point.
 */
function peakFrequency(power: Float64Array, f: Float64Array, j: number, step: number): number {
  if (j <= 0 || j >= f.length - 1) return f[j]!;
  const a = power[j - 1]!, b = power[j]!, c = power[j + 1]!;
  const denom = a - 2 * b + c;
  if (!(denom < 0)) return f[j]!;
  let shift = 0.5 * (a - c) / denom;
  if (shift > 0.5) shift = 0.5;
  if (shift < -0.5) shift = -0.5;
  return f[j]! + shift * step;
}

/** Joint Nelder–Mead refinement of m frequencies on chi^2; keeps the start if not better. */
function refineFrequencies(
  fitter: SinusoidFitter,
  frequencies: Float64Array,
  m: number,
  step: number,
  startChi2: number,
): number {
  const start = frequencies.slice(0, m);
  const limit = 3 * step;
  const objective = (x: Float64Array): number => {
    for (let j = 0; j < m; j++) {
      if (!(Math.abs(x[j]! - start[j]!) <= limit) || !(x[j]! > 0)) return Infinity;
    }
    return fitter.solve(x, m);
  };
  const result = nelderMead(objective, start, {
    scale: 0.25 * step,
    maxEvaluations: 300 * (m + 1),
    tolerance: 1e-10,
    xTolerance: 1e-6 * step,
    restarts: 1,
  });
  if (result.value < startChi2 || Number.isNaN(startChi2)) {
    for (let j = 0; j < m; j++) frequencies[j] = result.x[j]!;
    return result.value;
  }
  return startChi2;
}
