/**
 * Numeric kernels shared by the diagnostics. Private to `src/diagnostics/`.
 * Draws are held chain-major: chain m occupies `[m*n, (m+1)*n)`.
 * @module
 */
import { quantileSorted } from "./quantile.ts";

/** Hyndman & Fan (1996) definition 7 quantile of sorted draws (shared definition). */
export { quantileSorted };

import type { ChainView } from "./chain_view.ts";
import { accumulateAutocovariance } from "./_fft.ts";
import { normalQuantile } from "./normal_quantile.ts";
import { sortWithIndex } from "./_sort.ts";

/** Draws of one quantity, chain-major. */
export interface Chains {
  readonly x: Float64Array;
  /** Number of chains. */
  readonly m: number;
  /** Draws per chain. */
  readonly n: number;
  /** False when any draw is NaN or infinite. */
  readonly finite: boolean;
}

/** Each walker's trace of `column` after `burn`, one chain per walker. */
export function extractChains(view: ChainView, column: number, burn: number): Chains {
  const { data, steps, walkers, columns } = view;
  const n = steps - burn;
  const x = new Float64Array(walkers * n);
  let finite = true;
  for (let s = 0; s < n; s++) {
    const row = (s + burn) * walkers;
    for (let w = 0; w < walkers; w++) {
      const v = data[(row + w) * columns + column]!;
      if (!Number.isFinite(v)) finite = false;
      x[w * n + s] = v;
    }
  }
  return { x, m: walkers, n, finite };
}

/**
 * Split each chain into its first and second half, dropping the middle draw
 * when the length is odd (Vehtari et al. 2021, arXiv:1903.08008, sec. 3.1:
 * split-R-hat compares halves so that a trend within a chain shows up as
 * between-chain variance; Gelman et al. 2013, BDA3, sec. 11.4).
 */
export function splitChains(c: Chains): Chains {
  const h = Math.floor(c.n / 2);
  const x = new Float64Array(2 * c.m * h);
  for (let j = 0; j < c.m; j++) {
    const src = j * c.n;
    const second = src + c.n - h;
    const dst = 2 * j * h;
    for (let i = 0; i < h; i++) {
      x[dst + i] = c.x[src + i]!;
      x[dst + h + i] = c.x[second + i]!;
    }
  }
  return { x, m: 2 * c.m, n: h, finite: c.finite };
}

/** Between- and within-chain summaries used by R-hat and ESS. */
export interface VarianceParts {
  /** Mean within-chain variance W (1/(n-1) per chain). */
  readonly within: number;
  /** var+ = (n-1)/n W + B/n. */
  readonly varPlus: number;
}

/**
 * W, B and var+ (Vehtari et al. 2021, sec. 3.1; Gelman et al. 2013, BDA3,
 * sec. 11.4): B/n = 1/(M-1) sum_m (mean_m - mean)^2,
 * W = 1/M sum_m s_m^2, var+ = (n-1)/n W + B/n.
 */
export function varianceParts(c: Chains): VarianceParts {
  const { x, m, n } = c;
  let sumMeans = 0;
  let sumVar = 0;
  const means = new Float64Array(m);
  for (let j = 0; j < m; j++) {
    // Mean as first + mean of offsets: exact for a constant chain, so its
    // variance is exactly 0 (a tied, rank-normalised chain must give W = 0).
    const first = x[j * n]!;
    let off = 0;
    for (let i = 0; i < n; i++) off += x[j * n + i]! - first;
    const mu = first + off / n;
    let ss = 0;
    for (let i = 0; i < n; i++) {
      const d = x[j * n + i]! - mu;
      ss += d * d;
    }
    means[j] = mu;
    sumMeans += mu;
    sumVar += ss / (n - 1);
  }
  const grand = sumMeans / m;
  let bOverN = 0;
  if (m > 1) {
    for (let j = 0; j < m; j++) {
      const d = means[j]! - grand;
      bOverN += d * d;
    }
    bOverN /= m - 1;
  }
  const within = sumVar / m;
  return { within, varPlus: ((n - 1) / n) * within + bOverN };
}

/**
 * Potential scale reduction R-hat = sqrt(var+ / W) of already split chains
 * (Vehtari et al. 2021, sec. 3.1). NaN when any draw is non-finite, when
 * chains have fewer than 2 draws, or when every draw is the same value;
 * Infinity when each chain is constant but the chains differ.
 */
export function rhatOfSplit(c: Chains): number {
  if (!c.finite || c.n < 2 || c.m < 2) return NaN;
  const { within, varPlus } = varianceParts(c);
  if (within === 0) return varPlus > 0 ? Infinity : NaN;
  return Math.sqrt(varPlus / within);
}

/**
 * Effective sample size of already split chains, multi-chain version with
 * Geyer's initial monotone sequence (Vehtari et al. 2021, sec. 3.2; Geyer
 * 1992, Statist. Sci. 7, 473, sec. 3.3).
 *
 * Method: per-chain biased autocovariances acov_m(t) by FFT; combined
 * autocorrelation rho_t = 1 - (W - mean_m acov_m(t)) / var+ (rho_0 = 1),
 * which also absorbs between-chain differences; pair sums
 * P_k = rho_{2k} + rho_{2k+1} taken while positive (initial positive
 * sequence), made non-increasing (initial monotone sequence);
 * tau = -1 + 2 sum_k P_k; ESS = M n / tau. tau is floored at 1/log10(M n)
 * (ESS at most M n log10(M n)), the cap of the paper's reference code, which
 * bounds the estimate for antithetic chains.
 *
 * NaN when any draw is non-finite, chains have fewer than 2 draws, or the
 * within-chain variance is zero.
 */
export function essOfSplit(c: Chains): number {
  if (!c.finite || c.n < 2 || c.m < 1) return NaN;
  const { m, n } = c;
  const { within, varPlus } = varianceParts(c);
  if (!(within > 0)) return NaN;
  const acov = new Float64Array(n);
  accumulateAutocovariance(c.x, m, n, acov, false);
  const invM = 1 / m;
  const rho = (t: number): number => t === 0 ? 1 : 1 - (within - acov[t]! * invM) / varPlus;
  let sum = 0;
  let prev = Infinity;
  for (let k = 0; 2 * k + 1 < n; k++) {
    let p = rho(2 * k) + rho(2 * k + 1);
    if (!(p > 0)) break;
    if (p > prev) p = prev;
    sum += p;
    prev = p;
  }
  const total = m * n;
  let tau = -1 + 2 * sum;
  const floor = total > 1 ? 1 / Math.log10(total) : 1;
  if (!(tau >= floor)) tau = floor;
  return total / tau;
}

/** Ascending copy of the draws (radix sort; draws must be finite). */
export function sortedCopy(x: Float64Array): Float64Array {
  return sortWithIndex(x).sorted;
}

/**
 * Rank normalisation (Vehtari et al. 2021, sec. 4.1): pooled average ranks r
 * (ties share the mean of their ranks) mapped to
 * z = Φ⁻¹((r - 3/8) / (S + 1/4)), Blom's (1958) plotting positions
 * (G. Blom, Statistical Estimates and Transformed Beta-Variables, Wiley).
 * Returns the normalised chains and the sorted draws.
 */
export function rankNormalise(c: Chains): { z: Chains; sorted: Float64Array } {
  const s = c.x.length;
  const { sorted, order } = sortWithIndex(c.x);
  const z = new Float64Array(s);
  const denom = s + 0.25;
  let i = 0;
  while (i < s) {
    let j = i + 1;
    while (j < s && sorted[j] === sorted[i]) j++;
    // Positions i..j-1 (ranks i+1..j) share one value.
    const value = normalQuantile((0.5 * (i + 1 + j) - 0.375) / denom);
    for (let k = i; k < j; k++) z[order[k]!] = value;
    i = j;
  }
  return { z: { x: z, m: c.m, n: c.n, finite: c.finite }, sorted };
}

/**
 * Folding (Vehtari et al. 2021, sec. 4.1): zeta = |theta - median(theta)|,
 * so that a chain with a different spread shows up as a location difference.
 */
export function fold(c: Chains, median: number): Chains {
  const x = new Float64Array(c.x.length);
  for (let i = 0; i < x.length; i++) x[i] = Math.abs(c.x[i]! - median);
  return { x, m: c.m, n: c.n, finite: c.finite };
}

/** Indicator I(theta <= q) of each draw (Vehtari et al. 2021, sec. 4.3). */
export function indicator(c: Chains, q: number): Chains {
  const x = new Float64Array(c.x.length);
  for (let i = 0; i < x.length; i++) x[i] = c.x[i]! <= q ? 1 : 0;
  return { x, m: c.m, n: c.n, finite: c.finite };
}

/**
 * The recommended R-hat, max(bulk, tail) (Vehtari et al. 2021, sec. 4.1),
 * ignoring a NaN part (a folded chain can be constant when the bulk is not);
 * NaN only when both are.
 */
export function combineRhat(bulk: number, tail: number): number {
  if (Number.isNaN(bulk)) return tail;
  if (Number.isNaN(tail)) return bulk;
  return Math.max(bulk, tail);
}

/** Pooled mean and sample standard deviation (1/(S-1)). */
export function meanSd(x: Float64Array): { mean: number; sd: number } {
  const s = x.length;
  if (s === 0) return { mean: NaN, sd: NaN };
  let mu = 0;
  for (let i = 0; i < s; i++) mu += x[i]!;
  mu /= s;
  let ss = 0;
  for (let i = 0; i < s; i++) {
    const d = x[i]! - mu;
    ss += d * d;
  }
  return { mean: mu, sd: s > 1 ? Math.sqrt(ss / (s - 1)) : NaN };
}

/** Everything the convergence report needs about one quantity's split draws. */
export interface SplitSummary {
  readonly rhatClassic: number;
  readonly rhatBulk: number;
  readonly rhatTail: number;
  readonly essBulk: number;
  readonly essTail: number;
  readonly essMean: number;
  readonly mean: number;
  readonly sd: number;
}

const NAN_SUMMARY: SplitSummary = {
  rhatClassic: NaN,
  rhatBulk: NaN,
  rhatTail: NaN,
  essBulk: NaN,
  essTail: NaN,
  essMean: NaN,
  mean: NaN,
  sd: NaN,
};

/** R-hat (classic, bulk, tail), ESS (bulk, tail, mean), mean and sd. */
export function summariseSplit(split: Chains): SplitSummary {
  if (!split.finite || split.n < 2) {
    if (!split.finite || split.x.length === 0) return NAN_SUMMARY;
    const { mean, sd } = meanSd(split.x);
    return { ...NAN_SUMMARY, mean, sd };
  }
  const { mean, sd } = meanSd(split.x);
  const { z, sorted } = rankNormalise(split);
  const median = quantileSorted(sorted, 0.5);
  const folded = fold(split, median);
  const zFolded = rankNormalise(folded).z;
  const q05 = quantileSorted(sorted, 0.05);
  const q95 = quantileSorted(sorted, 0.95);
  const constant = sorted[0] === sorted[sorted.length - 1];
  return {
    rhatClassic: rhatOfSplit(split),
    rhatBulk: constant ? NaN : rhatOfSplit(z),
    rhatTail: constant ? NaN : rhatOfSplit(zFolded),
    essBulk: constant ? NaN : essOfSplit(z),
    essTail: Math.min(essOfSplit(indicator(split, q05)), essOfSplit(indicator(split, q95))),
    essMean: essOfSplit(split),
    mean,
    sd,
  };
}
