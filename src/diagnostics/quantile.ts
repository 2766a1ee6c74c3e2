/**
 * Sample quantiles of sorted draws — the one definition used by diagnostics,
 * summaries, figures and the dashboard.
 * @module
 */

/**
 * Quantile `p` of ascending-sorted values by linear interpolation between
 * order statistics.
 *
 * Method: Hyndman & Fan 1996, The American Statistician 50(4), 361,
 * Definition 7: with h = (n − 1) p, Q(p) = x[⌊h⌋] + (h − ⌊h⌋)(x[⌊h⌋+1] − x[⌊h⌋])
 * (0-based indices).
 *
 * Returns NaN for an empty array or `p` outside [0, 1].
 */
export function quantileSorted(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length;
  if (n === 0 || !(p >= 0 && p <= 1)) return NaN;
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, n - 1);
  const xlo = sorted[lo]!;
  return xlo + (h - lo) * (sorted[hi]! - xlo);
}
