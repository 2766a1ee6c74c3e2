/**
 * Posterior intervals from draws.
 * @module
 */

/** Median and central 68% / 95% intervals, in the parameter's unit. */
export interface Interval {
  readonly median: number;
  /** 16th percentile */
  readonly lo68: number;
  /** 84th percentile */
  readonly hi68: number;
  /** 2.5th percentile */
  readonly lo95: number;
  /** 97.5th percentile */
  readonly hi95: number;
  readonly unit: string;
}

/**
 * Quantile of sorted values by linear interpolation between order statistics,
 * definition 7 of Hyndman & Fan (1996, The American Statistician 50, 361):
 * h = (n − 1)p, Q = x[⌊h⌋] + (h − ⌊h⌋)(x[⌊h⌋+1] − x[⌊h⌋]). NaN for no values.
 */
export function quantileSorted(sorted: Float64Array, p: number): number {
  const n = sorted.length;
  if (n === 0 || !(p >= 0 && p <= 1)) return NaN;
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, n - 1);
  return sorted[lo]! + (h - lo) * (sorted[hi]! - sorted[lo]!);
}

/** Interval of unsorted draws (NaN draws are ignored). */
export function interval(draws: Float64Array, unit: string): Interval {
  const s = draws.filter((x) => !Number.isNaN(x)).sort();
  return {
    median: quantileSorted(s, 0.5),
    lo68: quantileSorted(s, 0.16),
    hi68: quantileSorted(s, 0.84),
    lo95: quantileSorted(s, 0.025),
    hi95: quantileSorted(s, 0.975),
    unit,
  };
}
