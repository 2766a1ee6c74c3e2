/**
 * Small descriptive statistics the dashboard derives from posterior draws:
 * quantiles, central intervals, histograms, highest-density regions, the
 * remaining-time estimate and the good/warning/bad convergence marks.
 *
 * Pure functions over `Float64Array`; no clock, files or console. The
 * convergence figures themselves (R-hat, ESS, tau) are computed in
 * `src/diagnostics/` and arrive in the snapshot; here they are only judged.
 * @module
 */
import { quantileSorted } from "../src/diagnostics/quantile.ts";

/** Hyndman & Fan (1996) definition 7 quantile of sorted draws (shared definition). */
export { quantileSorted };

/** Probability below the central 68.27% interval: Φ(−1), the ±1σ mass of a Gaussian. */
export const LOWER_68 = 0.15865525393145707;
/** Probability below the upper end of the central 68.27% interval: Φ(+1). */
export const UPPER_68 = 0.8413447460685429;

/**
 * Copy the finite values of `values` and sort them ascending.
 * NaN and ±Infinity are dropped.
 */
export function sortedFinite(values: ArrayLike<number>): Float64Array {
  let count = 0;
  for (let i = 0; i < values.length; i++) {
    if (Number.isFinite(values[i])) count++;
  }
  const out = new Float64Array(count);
  let j = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    if (Number.isFinite(v)) out[j++] = v;
  }
  return out.sort();
}

/** Median and central 68% interval of a set of draws. */
export interface Summary {
  /** Number of finite draws used. */
  readonly count: number;
  readonly median: number;
  /** Quantile {@link LOWER_68} (about the 16th percentile). */
  readonly lower: number;
  /** Quantile {@link UPPER_68} (about the 84th percentile). */
  readonly upper: number;
  readonly min: number;
  readonly max: number;
}

/**
 * Median and central 68% interval of ascending-sorted finite values
 * (see {@link sortedFinite}); all NaN when empty.
 */
export function summarizeSorted(sorted: ArrayLike<number>): Summary {
  const n = sorted.length;
  return {
    count: n,
    median: quantileSorted(sorted, 0.5),
    lower: quantileSorted(sorted, LOWER_68),
    upper: quantileSorted(sorted, UPPER_68),
    min: n > 0 ? sorted[0]! : NaN,
    max: n > 0 ? sorted[n - 1]! : NaN,
  };
}

/** Options of {@link displayRange}. */
export interface DisplayRangeOptions {
  /**
   * Probability left out at each end, so a few far outliers (a stuck walker)
   * do not squeeze the plot.
   * @default 0.005
   */
  readonly tail?: number;
}

/**
 * Range to plot ascending-sorted values over: from quantile `tail` to
 * quantile `1 − tail`, widened to a non-empty interval when all values are equal.
 * Returns `[NaN, NaN]` when empty.
 */
export function displayRange(
  sorted: ArrayLike<number>,
  options: DisplayRangeOptions = {},
): readonly [number, number] {
  const tail = options.tail ?? 0.005;
  let lo = quantileSorted(sorted, tail);
  let hi = quantileSorted(sorted, 1 - tail);
  if (Number.isNaN(lo) || Number.isNaN(hi)) return [NaN, NaN];
  if (!(hi > lo)) {
    const half = lo === 0 ? 0.5 : Math.abs(lo) * 1e-3;
    lo -= half;
    hi += half;
  }
  return [lo, hi];
}

/** Options of {@link histogram}. */
export interface HistogramOptions {
  /** Left edge of the first bin. @default the smallest finite value */
  readonly min?: number;
  /** Right edge of the last bin (inclusive). @default the largest finite value */
  readonly max?: number;
}

/**
 * Counts of `values` in `bins` equal-width bins over [min, max]. Values
 * outside the range and non-finite values are not counted; a value equal to
 * `max` falls in the last bin. Bin i covers [min + i w, min + (i + 1) w).
 */
export function histogram(
  values: ArrayLike<number>,
  bins: number,
  options: HistogramOptions = {},
): Float64Array {
  const n = Math.max(0, Math.floor(bins));
  const counts = new Float64Array(n);
  if (n === 0) return counts;
  let min = options.min ?? Infinity;
  let max = options.max ?? -Infinity;
  if (options.min === undefined || options.max === undefined) {
    for (let i = 0; i < values.length; i++) {
      const v = values[i]!;
      if (!Number.isFinite(v)) continue;
      if (options.min === undefined && v < min) min = v;
      if (options.max === undefined && v > max) max = v;
    }
  }
  if (!(max >= min) || !Number.isFinite(min) || !Number.isFinite(max)) return counts;
  const width = (max - min) / n;
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    if (!(v >= min && v <= max)) continue;
    const k = width > 0 ? Math.min(n - 1, Math.floor((v - min) / width)) : 0;
    counts[k]!++;
  }
  return counts;
}

/** Options of {@link histogram2d}. */
export interface Histogram2dOptions {
  /** Bins along x. @default 20 */
  readonly columns?: number;
  /** Bins along y. @default 10 */
  readonly rows?: number;
  /** [min, max] along x. @default the range of the finite x values */
  readonly xRange?: readonly [number, number];
  /** [min, max] along y. @default the range of the finite y values */
  readonly yRange?: readonly [number, number];
}

/**
 * Joint counts of the pairs (x[i], y[i]) on a `columns` × `rows` grid,
 * row-major with row 0 at the lowest y: `counts[row * columns + column]`.
 * Pairs with a non-finite member or outside the ranges are not counted.
 */
export function histogram2d(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  options: Histogram2dOptions = {},
): Float64Array {
  const nx = Math.max(0, Math.floor(options.columns ?? 20));
  const ny = Math.max(0, Math.floor(options.rows ?? 10));
  const counts = new Float64Array(nx * ny);
  const n = Math.min(x.length, y.length);
  if (nx === 0 || ny === 0 || n === 0) return counts;
  const [x0, x1] = options.xRange ?? finiteRange(x);
  const [y0, y1] = options.yRange ?? finiteRange(y);
  if (!(x1 >= x0) || !(y1 >= y0)) return counts;
  const wx = (x1 - x0) / nx;
  const wy = (y1 - y0) / ny;
  for (let i = 0; i < n; i++) {
    const u = x[i]!;
    const v = y[i]!;
    if (!(u >= x0 && u <= x1 && v >= y0 && v <= y1)) continue;
    const cx = wx > 0 ? Math.min(nx - 1, Math.floor((u - x0) / wx)) : 0;
    const cy = wy > 0 ? Math.min(ny - 1, Math.floor((v - y0) / wy)) : 0;
    counts[cy * nx + cx]!++;
  }
  return counts;
}

function finiteRange(values: ArrayLike<number>): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    if (!Number.isFinite(v)) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return [lo, hi];
}

/**
 * Smooth a row-major `columns` × `rows` grid of counts with the 3 × 3
 * binomial kernel [1 2 1]ᵀ[1 2 1] / 16, renormalising the weights at the
 * edges so no mass leaks out (binomial smoothing, common practice, no source).
 */
export function smoothGrid(counts: ArrayLike<number>, columns: number, rows: number): Float64Array {
  const out = new Float64Array(columns * rows);
  const w = [1, 2, 1];
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < columns; c++) {
      let sum = 0;
      let weight = 0;
      for (let dr = -1; dr <= 1; dr++) {
        const rr = r + dr;
        if (rr < 0 || rr >= rows) continue;
        for (let dc = -1; dc <= 1; dc++) {
          const cc = c + dc;
          if (cc < 0 || cc >= columns) continue;
          const k = w[dr + 1]! * w[dc + 1]!;
          sum += k * counts[rr * columns + cc]!;
          weight += k;
        }
      }
      out[r * columns + c] = weight > 0 ? sum / weight : 0;
    }
  }
  return out;
}

/**
 * For each cell of a histogram, how many of the highest-density regions
 * holding the given fractions of the counts contain it.
 *
 * Method: the region for fraction f is the smallest set of cells, taken in
 * order of decreasing count, whose counts add up to at least f of the total;
 * cells tied with the last cell taken are included too (common practice for
 * contour levels of a binned density, no source). With `fractions` ascending,
 * a cell in the smallest region gets `fractions.length`, a cell outside all
 * regions 0. Empty cells always get 0.
 */
export function densityLevels(
  counts: ArrayLike<number>,
  fractions: readonly number[],
): Uint8Array {
  const n = counts.length;
  const levels = new Uint8Array(n);
  const order = new Float64Array(n);
  let total = 0;
  for (let i = 0; i < n; i++) {
    const c = counts[i]!;
    order[i] = c > 0 ? c : 0;
    total += order[i]!;
  }
  if (total <= 0) return levels;
  order.sort().reverse();
  const thresholds = fractions.map((f) => {
    let cumulative = 0;
    for (let k = 0; k < n; k++) {
      cumulative += order[k]!;
      if (cumulative >= f * total * (1 - 1e-12)) return order[k]!;
    }
    return order[n - 1]!;
  });
  for (let i = 0; i < n; i++) {
    const c = counts[i]!;
    if (!(c > 0)) continue;
    let level = 0;
    for (const t of thresholds) if (c >= t) level++;
    levels[i] = level;
  }
  return levels;
}

/**
 * Pearson correlation coefficient of paired finite values; NaN with fewer
 * than two pairs or zero spread. Two-pass: means first, then the centred
 * sums r = Σ(x−x̄)(y−ȳ) / √(Σ(x−x̄)² Σ(y−ȳ)²) (textbook formula, e.g. Press et
 * al. 2007, Numerical Recipes 3rd ed., §14.5; section recalled from memory).
 */
export function correlation(x: ArrayLike<number>, y: ArrayLike<number>): number {
  const n = Math.min(x.length, y.length);
  let count = 0;
  let mx = 0;
  let my = 0;
  for (let i = 0; i < n; i++) {
    const u = x[i]!;
    const v = y[i]!;
    if (!Number.isFinite(u) || !Number.isFinite(v)) continue;
    count++;
    mx += u;
    my += v;
  }
  if (count < 2) return NaN;
  mx /= count;
  my /= count;
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    const u = x[i]!;
    const v = y[i]!;
    if (!Number.isFinite(u) || !Number.isFinite(v)) continue;
    sxy += (u - mx) * (v - my);
    sxx += (u - mx) * (u - mx);
    syy += (v - my) * (v - my);
  }
  return sxx > 0 && syy > 0 ? sxy / Math.sqrt(sxx * syy) : NaN;
}

/**
 * Seconds left to reach `totalSteps` from `step` at `stepsPerSecond`:
 * (total − step) / rate. Returns 0 when the run has reached its total and
 * NaN when the rate is unknown, zero or negative.
 */
export function etaSeconds(step: number, totalSteps: number, stepsPerSecond: number): number {
  if (step >= totalSteps) return 0;
  if (!(stepsPerSecond > 0) || !Number.isFinite(stepsPerSecond)) return NaN;
  return (totalSteps - step) / stepsPerSecond;
}

/** Fraction of the run done, clamped to [0, 1]; 0 when the total is not positive. */
export function progressFraction(step: number, totalSteps: number): number {
  if (!(totalSteps > 0) || !Number.isFinite(step)) return 0;
  return Math.min(1, Math.max(0, step / totalSteps));
}

/** Judgement of one convergence figure. */
export type Mark = "good" | "warn" | "bad" | "unknown";

/** R-hat above this is "bad" even when the run's threshold is looser than usual. */
const RHAT_BAD = 1.1;

/**
 * Mark an R-hat value: good at or below `threshold` (Vehtari et al. 2021,
 * Bayesian Analysis 16(2), 667, arXiv:1903.08008, recommend 1.01, recalled
 * from memory); warning up to 1.1, the older customary cut (common practice,
 * no source); bad above; unknown when NaN.
 */
export function rhatMark(rhat: number, threshold: number): Mark {
  if (Number.isNaN(rhat)) return "unknown";
  if (rhat <= threshold) return "good";
  if (rhat <= Math.max(RHAT_BAD, threshold)) return "warn";
  return "bad";
}

/**
 * Mark a figure that should reach `threshold` (ESS, steps per tau): good at
 * or above it, warning from half of it, bad below half (the half-way band is
 * common practice, no source); unknown when NaN.
 */
export function atLeastMark(value: number, threshold: number): Mark {
  if (Number.isNaN(value)) return "unknown";
  if (value >= threshold) return "good";
  if (value >= threshold / 2) return "warn";
  return "bad";
}

const MARK_RANK: Readonly<Record<Mark, number>> = { good: 0, unknown: 1, warn: 2, bad: 3 };

/** The worst of several marks (bad > warn > unknown > good); good when empty. */
export function worstMark(marks: readonly Mark[]): Mark {
  let worst: Mark = "good";
  for (const m of marks) if (MARK_RANK[m] > MARK_RANK[worst]) worst = m;
  return worst;
}
