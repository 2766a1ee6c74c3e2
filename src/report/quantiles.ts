/**
 * Posterior intervals from draws.
 * @module
 */
import { quantileSorted } from "../diagnostics/quantile.ts";

/** Hyndman & Fan (1996) definition 7 quantile of sorted draws (shared definition). */
export { quantileSorted };

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
