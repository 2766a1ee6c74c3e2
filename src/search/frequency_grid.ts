/**
 * Evenly spaced frequency grid for periodograms.
 * @module
 */
import type { Days } from "../units.ts";
import { timeRange } from "./_series.ts";

/** Evenly spaced frequencies f_k = start + k * step, k = 0..count-1 (cycles per day). */
export interface FrequencyGrid {
  /** First (lowest) frequency, 1/d. */
  readonly start: number;
  /** Spacing, 1/d. */
  readonly step: number;
  /** Number of frequencies. */
  readonly count: number;
  /** The frequencies themselves, ascending (so periods descend). */
  readonly frequencies: Float64Array;
}

/** Options of {@linkcode frequencyGrid}. */
export interface FrequencyGridOptions {
  /** Shortest period searched, days. @default 1 */
  minPeriod?: Days;
  /** Longest period searched, days. @default the time span of the data */
  maxPeriod?: Days;
  /** Grid points per natural resolution element 1/span. @default 5 */
  oversample?: number;
  /** Number of leading entries of `time` to use. @default time.length */
  count?: number;
  /** Refuse grids larger than this. @default 10_000_000 */
  maxFrequencies?: number;
}

/**
 * Frequency grid from f_min = 1/maxPeriod to f_max = 1/minPeriod with spacing
 * df = 1 / (oversample * span), span = max(time) - min(time).
 *
 * Method: the natural frequency resolution of a series of span T is 1/T; peaks
 * have width ~1/T, so sampling each resolution element `oversample` times
 * (5 to 10 is usual; VanderPlas 2018, ApJS 236, 16, Sect. 7.1, recalled from
 * memory) keeps the grid maximum within a few per cent of the true peak
 * height. The grid includes f_min and stops at the last point <= f_max.
 *
 * Throws RangeError for fewer than two distinct times, non-positive or
 * inverted period limits, oversample < 1, or more than `maxFrequencies` points.
 */
export function frequencyGrid(
  time: ArrayLike<number>,
  options: FrequencyGridOptions = {},
): FrequencyGrid {
  const n = options.count ?? time.length;
  if (!Number.isInteger(n) || n < 2 || n > time.length) {
    throw new RangeError(
      `Cannot build frequency grid as at least two times are needed: count=${n}, length=${time.length}`,
    );
  }
  const [lo, hi] = timeRange(time, n);
  const span = hi - lo;
  if (!(span > 0) || !Number.isFinite(span)) {
    throw new RangeError(
      `Cannot build frequency grid as the time span must be positive: span=${span}`,
    );
  }
  const minPeriod = options.minPeriod ?? 1;
  const maxPeriod = options.maxPeriod ?? span;
  const oversample = options.oversample ?? 5;
  const maxFrequencies = options.maxFrequencies ?? 10_000_000;
  if (!(minPeriod > 0) || !(maxPeriod > minPeriod) || !Number.isFinite(maxPeriod)) {
    throw new RangeError(
      `Cannot build frequency grid as periods must satisfy 0 < minPeriod < maxPeriod: ` +
        `minPeriod=${minPeriod}, maxPeriod=${maxPeriod}`,
    );
  }
  if (!(oversample >= 1) || !Number.isFinite(oversample)) {
    throw new RangeError(
      `Cannot build frequency grid as oversample must be at least 1: oversample=${oversample}`,
    );
  }
  const start = 1 / maxPeriod;
  const stop = 1 / minPeriod;
  const step = 1 / (oversample * span);
  const count = Math.floor((stop - start) / step * (1 + 1e-12)) + 1;
  if (count > maxFrequencies) {
    throw new RangeError(
      `Cannot build frequency grid as it is too large: frequencies=${count}, ` +
        `maxFrequencies=${maxFrequencies}`,
    );
  }
  const frequencies = new Float64Array(count);
  for (let k = 0; k < count; k++) frequencies[k] = start + k * step;
  return { start, step, count, frequencies };
}
