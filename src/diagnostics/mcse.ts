/**
 * Monte Carlo standard errors of the mean and of quantiles (Vehtari et al.
 * 2021, Bayesian Analysis 16(2), 667, arXiv:1903.08008, secs. 3.2 and 4.4).
 * @module
 */

import type { ChainView } from "./chain_view.ts";
import { checkArgs } from "./_args.ts";
import {
  essOfSplit,
  extractChains,
  indicator,
  meanSd,
  quantileSorted,
  sortedCopy,
  splitChains,
} from "./_core.ts";
import { checkProb, type QuantileOptions } from "./ess.ts";
import type { ColumnOptions } from "./rhat.ts";

/**
 * MCSE of the posterior mean: sd / sqrt(ESS), with sd the pooled sample
 * standard deviation and ESS the multi-chain ESS of the raw split chains
 * (Vehtari et al. 2021, sec. 3.2). NaN when the ESS is undefined.
 * @throws {TypeError} on a malformed view; {RangeError} on a bad column or burn.
 */
export function mcseMean(view: ChainView, column: number, options: ColumnOptions = {}): number {
  const burn = checkArgs(view, column, options.burn);
  const split = splitChains(extractChains(view, column, burn));
  const ess = essOfSplit(split);
  return meanSd(split.x).sd / Math.sqrt(ess);
}

/**
 * MCSE of the `prob` quantile (Vehtari et al. 2021, sec. 4.4).
 *
 * Method: with S_q the ESS of the indicator I(theta <= q_prob), the
 * uncertainty of the quantile's probability level is taken as the central
 * ±1 sd interval of Beta(S_q p + 1, S_q (1 - p) + 1); here that interval is
 * approximated by the normal one, p ± sqrt(p (1 - p) / S_q), which is
 * accurate when S_q·min(p, 1 - p) >> 1 (a simplification of the paper's
 * Beta quantiles). The levels are mapped back through the sorted draws,
 * theta_lo = sorted[floor(a_lo S)], theta_hi = sorted[ceil(a_hi S)] (clamped,
 * 1-based), and MCSE = (theta_hi - theta_lo) / 2.
 *
 * NaN when the indicator ESS is undefined.
 * @throws {TypeError} on a malformed view; {RangeError} on a bad column, burn
 * or probability.
 */
export function mcseQuantile(view: ChainView, column: number, options: QuantileOptions): number {
  const burn = checkArgs(view, column, options.burn);
  const p = options.prob;
  checkProb(p);
  const split = splitChains(extractChains(view, column, burn));
  if (!split.finite || split.n < 2) return NaN;
  const sorted = sortedCopy(split.x);
  const ess = essOfSplit(indicator(split, quantileSorted(sorted, p)));
  if (!(ess > 0)) return NaN;
  const s = sorted.length;
  const half = Math.sqrt((p * (1 - p)) / ess);
  const lo = Math.min(Math.max(Math.floor((p - half) * s), 1), s);
  const hi = Math.min(Math.max(Math.ceil((p + half) * s), 1), s);
  return (sorted[hi - 1]! - sorted[lo - 1]!) / 2;
}
