/**
 * Effective sample sizes: bulk, tail, mean and quantile (Vehtari et al. 2021,
 * Bayesian Analysis 16(2), 667, arXiv:1903.08008, secs. 3.2 and 4.3).
 * @module
 */

import type { ChainView } from "./chain_view.ts";
import { checkArgs } from "./_args.ts";
import {
  essOfSplit,
  extractChains,
  indicator,
  quantileSorted as quantileAt,
  rankNormalise,
  sortedCopy,
  splitChains,
} from "./_core.ts";
import type { ColumnOptions } from "./rhat.ts";

/**
 * Bulk ESS: multi-chain ESS (Geyer's initial monotone sequence) of the
 * rank-normalised split chains (Vehtari et al. 2021, secs. 3.2 and 4.2).
 *
 * NaN when fewer than 4 steps remain, any draw is non-finite or all draws are
 * equal.
 * @throws {TypeError} on a malformed view; {RangeError} on a bad column or burn.
 */
export function essBulk(view: ChainView, column: number, options: ColumnOptions = {}): number {
  const burn = checkArgs(view, column, options.burn);
  const split = splitChains(extractChains(view, column, burn));
  if (!split.finite || split.n < 2) return NaN;
  const { z, sorted } = rankNormalise(split);
  if (sorted[0] === sorted[sorted.length - 1]) return NaN;
  return essOfSplit(z);
}

/**
 * ESS of the raw (not rank-normalised) split chains: the ESS that governs the
 * Monte Carlo error of the mean (Vehtari et al. 2021, sec. 3.2). For an AR(1)
 * chain this estimates S / tau with tau = (1 + rho)/(1 - rho).
 *
 * NaN in the same cases as {@link essBulk}.
 * @throws {TypeError} on a malformed view; {RangeError} on a bad column or burn.
 */
export function essMean(view: ChainView, column: number, options: ColumnOptions = {}): number {
  const burn = checkArgs(view, column, options.burn);
  return essOfSplit(splitChains(extractChains(view, column, burn)));
}

/** Options of {@link essQuantile}. */
export interface QuantileOptions extends ColumnOptions {
  /** Probability of the quantile, in (0, 1). */
  prob: number;
}

/**
 * ESS for the `prob` quantile: ESS of the split indicator chains
 * I(theta <= q_prob), q_prob the pooled sample quantile (Vehtari et al. 2021,
 * sec. 4.3). NaN when the indicator is constant.
 * @throws {TypeError} on a malformed view; {RangeError} on a bad column, burn
 * or probability.
 */
export function essQuantile(view: ChainView, column: number, options: QuantileOptions): number {
  const burn = checkArgs(view, column, options.burn);
  checkProb(options.prob);
  const split = splitChains(extractChains(view, column, burn));
  if (!split.finite || split.n < 2) return NaN;
  const sorted = sortedCopy(split.x);
  return essOfSplit(indicator(split, quantileAt(sorted, options.prob)));
}

/**
 * Tail ESS: the smaller of the 5 % and 95 % quantile ESS (Vehtari et al. 2021,
 * sec. 4.3).
 * @throws {TypeError} on a malformed view; {RangeError} on a bad column or burn.
 */
export function essTail(view: ChainView, column: number, options: ColumnOptions = {}): number {
  const burn = options.burn ?? 0;
  return Math.min(
    essQuantile(view, column, { burn, prob: 0.05 }),
    essQuantile(view, column, { burn, prob: 0.95 }),
  );
}

/** @throws {RangeError} unless 0 < prob < 1. */
export function checkProb(prob: number): void {
  if (!(prob > 0 && prob < 1)) {
    throw new RangeError(`Cannot take quantile as probability is outside (0, 1): prob=${prob}`);
  }
}
